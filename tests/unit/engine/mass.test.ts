import { describe, expect, it } from 'vitest';
import { effectiveMassKg, kinematicsMatrix, movingMassKg, pulleyInertiaEstimateKgM2 } from '@/engine';

/**
 * Independent inertia of the assumed pulley shape: ∫ r² dm by summing thin rings (midpoint rule, 4000 rings per
 * section) over the belt section, two flanges and the hub, instead of the ½·m·r² closed form.
 */
function ringSumInertiaKgM2(sections: [diameterMm: number, lengthMm: number][]): number {
  let j = 0;
  for (const [dMm, lMm] of sections) {
    const rMax = dMm / 2000;
    const n = 4000;
    for (let i = 0; i < n; i++) {
      const r = ((i + 0.5) / n) * rMax;
      const dm = 2700 * 2 * Math.PI * r * (rMax / n) * (lMm / 1000);
      j += dm * r * r;
    }
  }
  return j;
}

describe('pulleyInertiaEstimateKgM2', () => {
  it('when a 20-tooth 2 mm drive pulley for a 6 mm belt is estimated, then a ring sum over the assumed shape agrees (independent)', () => {
    // Arrange: pitch diameter 12.732 mm; belt section 7 mm long, flanges 16.732 mm × 1 mm, hub 16.732 mm × 7 mm
    const d = 40 / Math.PI;
    const expected = ringSumInertiaKgM2([
      [d, 7],
      [d + 4, 2],
      [d + 4, 7],
    ]);
    // Act
    const j = pulleyInertiaEstimateKgM2({ teeth: 20, pitchMm: 2, beltWidthMm: 6 });
    // Assert
    expect(j).toBeCloseTo(expected, 12);
    expect(Math.abs(j - expected) / expected).toBeLessThan(1e-6);
  });

  it('when an idler is estimated, then it has no hub and is lighter than the drive pulley of the same size', () => {
    // Arrange
    const d = 40 / Math.PI;
    // Act
    const idler = pulleyInertiaEstimateKgM2({ teeth: 20, pitchMm: 2, beltWidthMm: 6, hasHub: false });
    // Assert
    expect(idler).toBeCloseTo(
      ringSumInertiaKgM2([
        [d, 7],
        [d + 4, 2],
      ]),
      12,
    );
    expect(idler).toBeLessThan(pulleyInertiaEstimateKgM2({ teeth: 20, pitchMm: 2, beltWidthMm: 6 }));
  });

  it('when the drive pulley estimate includes the hub, then it is about three times the old solid-cylinder figure', () => {
    // Arrange: the old estimate, a solid cylinder of the pitch diameter and (w + 4 mm) length
    const r = 20 / Math.PI / 1000;
    const old = 0.5 * 2700 * Math.PI * r ** 4 * 0.01;
    // Act
    const j = pulleyInertiaEstimateKgM2({ teeth: 20, pitchMm: 2, beltWidthMm: 6 });
    // Assert: from memory, a 20-tooth aluminium pulley with its hub weighs about 8–10 g, J ≈ 2e-7 kg·m²
    expect(j / old).toBeGreaterThan(2.5);
    expect(j / old).toBeLessThan(4);
    expect(j).toBeGreaterThan(1.5e-7);
    expect(j).toBeLessThan(3e-7);
  });
});

describe('movingMassKg', () => {
  it.each([
    ['corexy', 0.4, 0.85],
    ['hbot', 0.4, 0.85],
    // cartesian: the X motor rides the gantry (docs/models/masses-and-inertia.md)
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
