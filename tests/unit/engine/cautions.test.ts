import { describe, expect, it } from 'vitest';
import { CAUTIONS, defaultDesign, evaluateDesign } from '@/engine';

describe('CAUTIONS', () => {
  it('when the cautions are listed, then pinch points, electrical supply, stored energy, hot motors, unexpected motion, emergency stop, tool hazards and deference to codes are all there (docs/models/checks.md "Cautions")', () => {
    expect(CAUTIONS.map((c) => c.id)).toEqual([
      'pinch-points',
      'electrical-supply',
      'stored-energy',
      'hot-motors',
      'unexpected-motion',
      'emergency-stop',
      'tool-hazards',
      'codes-and-practice',
    ]);
    expect(CAUTIONS.find((c) => c.id === 'electrical-supply')!.text).toMatch(/mains/);
    expect(CAUTIONS.find((c) => c.id === 'codes-and-practice')!.text).toMatch(/local codes/);
    expect(CAUTIONS.find((c) => c.id === 'codes-and-practice')!.text).toMatch(/licensed/);
  });

  it('when the cautions are listed, then hot motors, motion at power-up and homing, the emergency stop and the tool are covered (issue 13)', () => {
    // Arrange
    const text = (id: string) => CAUTIONS.find((c) => c.id === id)?.text ?? '';
    // Assert
    expect(text('hot-motors')).toMatch(/hot/);
    expect(text('unexpected-motion')).toMatch(/power/);
    expect(text('unexpected-motion')).toMatch(/homing/);
    expect(text('emergency-stop')).toMatch(/emergency stop/);
    expect(text('tool-hazards')).toMatch(/tool/);
  });

  it('when any design is evaluated, then its result carries every caution', () => {
    expect(evaluateDesign(defaultDesign('hbot')).cautions).toEqual(CAUTIONS);
  });
});
