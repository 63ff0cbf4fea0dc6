import { describe, expect, it } from 'vitest';
import { effectiveMassKg, kinematicsMatrix, movingMassKg, pulleyInertiaEstimateKgM2 } from '@/engine';

describe('pulleyInertiaEstimateKgM2', () => {
  it('when a 20-tooth 2 mm pulley for 6 mm belt is estimated, then J = ½·ρ·π·r⁴·(w + 4 mm) with ρ = 2700 kg/m³', () => {
    const r = (20 * 2) / (2 * Math.PI) / 1000;
    expect(pulleyInertiaEstimateKgM2({ teeth: 20, pitchMm: 2, beltWidthMm: 6 })).toBeCloseTo(0.5 * 2700 * Math.PI * r ** 4 * 0.01, 15);
  });
});

describe('movingMassKg', () => {
  it.each([
    ['corexy', 0.4, 0.85],
    ['hbot', 0.4, 0.85],
    // cartesian: the X motor rides the gantry (format.md "Moving mass")
    ['cartesian', 0.4, 1.13],
  ] as const)('when a %s stage carries 0.3 + 0.1 kg on a 0.45 kg gantry, then X moves %d kg and Y %d kg', (mechanism, x, y) => {
    const m = movingMassKg({ mechanism, carriageKg: 0.3, toolKg: 0.1, gantryKg: 0.45, motorKg: 0.28 });
    expect(m.xKg).toBeCloseTo(x, 12);
    expect(m.yKg).toBeCloseTo(y, 12);
  });
});

describe('effectiveMassKg', () => {
  // Kinetic energy: ω_A = (v_X + v_Y)/r, ω_B = (v_X − v_Y)/r, so each crossed-belt axis sees 2·J/r² (derived).
  it.each([
    [0, 0.4 + 2 * 0.15],
    [90, 0.85 + 2 * 0.15],
    [45, (0.4 + 0.85) / 2 + 2 * 0.15],
  ])('when a crossed-belt carriage moves along %d°, then its effective mass is %d kg', (deg, expected) => {
    const m = effectiveMassKg({
      k: kinematicsMatrix('corexy'),
      xKg: 0.4,
      yKg: 0.85,
      motorEquivalentKg: [0.15, 0.15],
      directionRad: (deg * Math.PI) / 180,
    });
    expect(m).toBeCloseTo(expected, 12);
  });
});
