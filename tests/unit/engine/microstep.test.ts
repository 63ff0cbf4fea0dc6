import { describe, expect, it } from 'vitest';
import { kinematicsMatrix, microstepFigures, motorToCarriage } from '@/engine';

/**
 * Independent smallest move: search every pair of whole microstep counts (nA, nB) up to 8 for the shortest non-zero
 * carriage move in the wanted direction (through motorToCarriage, the forward relation), instead of the engine's
 * s/v rule.
 */
function searchSmallestMm(mechanism: 'corexy' | 'hbot' | 'cartesian', s: number, dirDeg: number): number {
  let best = Infinity;
  const u = [Math.cos((dirDeg * Math.PI) / 180), Math.sin((dirDeg * Math.PI) / 180)];
  for (let a = -8; a <= 8; a++)
    for (let b = -8; b <= 8; b++) {
      const { dxMm, dyMm } = motorToCarriage({ mechanism, daMm: a * s, dbMm: b * s });
      const len = Math.hypot(dxMm, dyMm);
      if (len < 1e-12) continue;
      if (Math.abs(dxMm * u[1] - dyMm * u[0]) < 1e-12 && dxMm * u[0] + dyMm * u[1] > 0) best = Math.min(best, len);
    }
  return best;
}

describe('microstepFigures', () => {
  it.each(['corexy', 'hbot', 'cartesian'] as const)(
    'when a %s stage steps 0.0125 mm of belt, then the axis and diagonal figures equal an exhaustive search over whole microsteps (independent)',
    (mech) => {
      // Arrange
      const s = 0.0125;
      // Act
      const f = microstepFigures(kinematicsMatrix(mech), s);
      // Assert
      expect(f.axisMm).toBeCloseTo(Math.max(searchSmallestMm(mech, s, 0), searchSmallestMm(mech, s, 90)), 12);
      expect(f.diagonalMm).toBeCloseTo(Math.max(searchSmallestMm(mech, s, 45), searchSmallestMm(mech, s, 135)), 12);
      const one = motorToCarriage({ mechanism: mech, daMm: s, dbMm: 0 });
      expect(f.oneMotorMm).toBeCloseTo(Math.hypot(one.dxMm, one.dyMm), 12);
    },
  );

  it('when motor A is wired the other way, then its one-motor direction turns by 180°', () => {
    // Arrange / Act
    const f = microstepFigures(kinematicsMatrix('corexy', { a: -1, b: 1 }), 0.0125);
    // Assert
    expect(f.oneMotorDirectionDeg).toBeCloseTo(225, 9);
  });
});
