import { describe, expect, it } from 'vitest';
import { EngineInputError, defaultDesign, sweep } from '@/engine';

describe('sweep', () => {
  it.each([
    // common practice: 200 × 16 / (z × 2 mm)
    [16, 100],
    [20, 80],
    [25, 64],
  ])('when the drive pulley is swept to %i teeth, then steps/mm is %d', (teeth, expected) => {
    const r = sweep(defaultDesign('corexy'), 'pulley.driveTeeth', [teeth]);
    const p = r.points[0];
    expect(p.ok).toBe(true);
    if (p.ok) expect(p.stepsPerMm).toBeCloseTo(expected, 9);
  });

  it('when the carriage gets heavier along the sweep, then accelerations fall and resonance drops', () => {
    const r = sweep(defaultDesign('hbot'), 'masses.carriageKg', [0.2, 0.4, 0.8]);
    const ok = r.points.filter((p) => p.ok);
    expect(ok).toHaveLength(3);
    for (let i = 1; i < ok.length; i++) {
      const [a, b] = [ok[i - 1], ok[i]];
      if (!a.ok || !b.ok) continue;
      expect(b.accelMaxMPerS2.x).toBeLessThan(a.accelMaxMPerS2.x);
      expect(b.accelMaxMPerS2.worst).toBeLessThan(a.accelMaxMPerS2.worst);
      expect(b.lowestFrequencyHz).toBeLessThan(a.lowestFrequencyHz);
    }
  });

  it('when some values are invalid, then each gets an error entry naming the field and the rest are evaluated', () => {
    const r = sweep(defaultDesign('corexy'), 'driver.microsteps', [8, 3, 32]);
    expect(r.points.map((p) => p.ok)).toEqual([true, false, true]);
    const bad = r.points[1];
    if (!bad.ok) expect(bad.issues[0].path).toBe('driver.microsteps');
  });

  it('when the path names an unknown field, then each value gets an unknown-field entry', () => {
    const r = sweep(defaultDesign('corexy'), 'frame.colour', ['red']);
    const p = r.points[0];
    expect(p.ok).toBe(false);
    if (!p.ok) expect(p.issues[0].path).toBe('frame.colour');
  });

  it('when the path goes through a number, then the entry says it is not a group of fields', () => {
    const r = sweep(defaultDesign('corexy'), 'pretensionN.x', [1]);
    const p = r.points[0];
    if (!p.ok) expect(p.issues[0].message).toMatch(/not a group of fields/);
    expect(p.ok).toBe(false);
  });

  it.each([
    ['', 'path'],
    ['../x', 'path'],
  ])('when the path is %j, then it throws EngineInputError', (path) => {
    expect(() => sweep(defaultDesign('corexy'), path, [1])).toThrow(EngineInputError);
  });
});
