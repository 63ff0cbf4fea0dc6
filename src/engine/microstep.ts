import { inverse2, type Matrix2 } from './linalg';

// Derivation: docs/models/resolution.md.

/** The three carriage figures of one microstep, each named for what it is. */
export interface MicrostepFigures {
  /** Carriage move for one microstep of one motor while the other holds [mm]. */
  oneMotorMm: number;
  /** Direction of that move for a positive step of motor A [°] (crossed belts ±45°, cartesian along X). */
  oneMotorDirectionDeg: number;
  /** Smallest pure X or pure Y move (the larger of the two) [mm]. */
  axisMm: number;
  /** Smallest pure move along a 45° diagonal (the larger of the two diagonals) [mm]. */
  diagonalMm: number;
}

/**
 * Smallest carriage move along a unit direction u that every motor can make in whole microsteps: the motors need
 * K·u·d of belt, and every non-zero entry must be a whole number of microsteps s. K's entries are 0 or ±1 for every
 * mechanism, so the non-zero entries of K·u along the axes and the diagonals have equal size v and d = s/v.
 */
function smallestMoveMm(k: Matrix2, ux: number, uy: number, beltMicrostepMm: number): number {
  const a = Math.abs(k[0][0] * ux + k[0][1] * uy);
  const b = Math.abs(k[1][0] * ux + k[1][1] * uy);
  const v = Math.max(a, b);
  return beltMicrostepMm / v;
}

/**
 * Carriage figures of one microstep: one motor alone (the column of K⁻¹ times the belt microstep s), the smallest
 * pure X or Y move (s for every mechanism) and the smallest pure 45° diagonal move (s/√2 on crossed belts, where
 * one motor does it, s·√2 on a cartesian stage, where both must step).
 * @param k - motor-to-carriage matrix K (motor directions applied)
 * @param beltMicrostepMm - belt travel of one microstep at a motor pulley s [mm]
 * @returns the three figures [mm] and the one-motor direction [°]
 * @see docs/models/resolution.md
 */
export function microstepFigures(k: Matrix2, beltMicrostepMm: number): MicrostepFigures {
  const kinv = inverse2(k);
  const oneMotor = Math.max(Math.hypot(kinv[0][0], kinv[1][0]), Math.hypot(kinv[0][1], kinv[1][1])) * beltMicrostepMm;
  const dirDeg = ((((Math.atan2(kinv[1][0], kinv[0][0]) * 180) / Math.PI) % 360) + 360) % 360;
  const h = Math.SQRT1_2;
  return {
    oneMotorMm: oneMotor,
    oneMotorDirectionDeg: dirDeg,
    axisMm: Math.max(smallestMoveMm(k, 1, 0, beltMicrostepMm), smallestMoveMm(k, 0, 1, beltMicrostepMm)),
    diagonalMm: Math.max(smallestMoveMm(k, h, h, beltMicrostepMm), smallestMoveMm(k, -h, h, beltMicrostepMm)),
  };
}
