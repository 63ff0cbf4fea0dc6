import { describe, expect, it } from 'vitest';
import { compareMechanisms, defaultDesign, sweep } from '@/engine';
import { getEngineRunner } from '@/workers/engineClient';

describe('engine runner what-if', () => {
  it('when the Design desk compares mechanisms, then it gets exactly the rows of POST /api/calc/compare', async () => {
    // Arrange
    const design = defaultDesign('hbot') as unknown as Record<string, unknown>;
    // Act
    const rows = await getEngineRunner().compare(design);
    // Assert: the engine's own comparison, no second definition of any figure
    expect(rows).toEqual(compareMechanisms(design).rows);
  });

  it('when the Design desk sweeps an input, then each progress point is the engine sweep point for that value', async () => {
    // Arrange
    const design = defaultDesign('corexy') as unknown as Record<string, unknown>;
    const values = [16, 3, 24];
    const seen: unknown[] = [];
    // Act
    const points = await getEngineRunner().sweep(design, { path: 'pulley.driveTeeth', values }, (_d, _t, p) => seen.push(p));
    // Assert
    expect(points).toEqual(sweep(design, 'pulley.driveTeeth', values).points);
    expect(seen).toEqual(points);
    expect(points.map((p) => p.ok)).toEqual([true, false, true]);
  });
});
