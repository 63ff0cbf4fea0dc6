import { describe, expect, it } from 'vitest';
import { CAUTIONS, defaultDesign, evaluateDesign } from '@/engine';

describe('CAUTIONS', () => {
  it('when the cautions are listed, then pinch points, electrical supply, stored energy and deference to codes are all there (docs/models/checks.md "Cautions")', () => {
    expect(CAUTIONS.map((c) => c.id)).toEqual(['pinch-points', 'electrical-supply', 'stored-energy', 'codes-and-practice']);
    expect(CAUTIONS.find((c) => c.id === 'electrical-supply')!.text).toMatch(/mains/);
    expect(CAUTIONS.find((c) => c.id === 'codes-and-practice')!.text).toMatch(/local codes/);
    expect(CAUTIONS.find((c) => c.id === 'codes-and-practice')!.text).toMatch(/licensed/);
  });

  it('when any design is evaluated, then its result carries every caution', () => {
    expect(evaluateDesign(defaultDesign('hbot')).cautions).toEqual(CAUTIONS);
  });
});
