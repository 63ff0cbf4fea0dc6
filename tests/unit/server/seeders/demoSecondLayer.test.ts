import { describe, expect, it } from 'vitest';
import { evaluateDesign } from '@/engine';
import { DEMO_DESIGNS, demoDesignDocument } from '../../../../server/seeders/202612020102-demo-designs';
import { demoJobCsv } from '../../../../server/seeders/202612041600-demo-second-layer';
import { parseJobCsv } from '../../../../server/uploads';

describe('demoJobCsv', () => {
  it('when made for the Sample tray picker, then it is a valid 50-point job inside the travel that the engine times', () => {
    // Arrange
    const doc = demoDesignDocument(DEMO_DESIGNS.find((d) => d.name === 'Sample tray picker')!);
    const travel = evaluateDesign({ ...doc, map: { points: 2 } }).travel;
    // Act
    const table = parseJobCsv(demoJobCsv(travel));
    const result = evaluateDesign({ ...doc, map: { points: 11 }, job: { points: table.points } });
    // Assert
    expect(table.points).toHaveLength(50);
    expect(result.job!.outsideTravel).toEqual([]);
    expect(result.job!.moves).toHaveLength(49);
    expect(result.job!.totalS).toBeGreaterThan(25 * 0.7);
  });
});
