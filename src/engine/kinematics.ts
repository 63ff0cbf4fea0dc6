import { requireNumber, throwInputError } from './errors';
import { apply2, inverse2, transpose2, type Matrix2 } from './linalg';
import type { Mechanism, MotorDirection } from './types';

/** The mechanisms the engine knows. */
export const MECHANISMS = ['corexy', 'hbot', 'cartesian'] as const satisfies readonly Mechanism[];

function checkMechanism(scope: string, mechanism: unknown): Mechanism {
  if (!MECHANISMS.includes(mechanism as Mechanism)) {
    throwInputError(scope, `must be one of ${MECHANISMS.join(', ')}, got ${String(mechanism)}`, 'mechanism');
  }
  return mechanism as Mechanism;
}

function checkDirection(scope: string, d: MotorDirection | undefined): MotorDirection {
  if (d === undefined) return { a: 1, b: 1 };
  if ((d.a !== 1 && d.a !== -1) || (d.b !== 1 && d.b !== -1)) {
    throwInputError(scope, 'each motor direction must be 1 or -1', 'motorDirection');
  }
  return d;
}

/**
 * Motor-to-carriage matrix K with [ΔA, ΔB]ᵀ = K·[ΔX, ΔY]ᵀ (belt displacement at each motor pulley).
 * Crossed belts (corexy, hbot): ΔA = ΔX + ΔY, ΔB = ΔX − ΔY; cartesian: ΔA = ΔX, ΔB = ΔY. A motor direction of
 * −1 flips that motor's row, because builders wire motors both ways and the sheet must say which way is +A.
 * @param mechanism - "corexy" | "hbot" | "cartesian"
 * @param motorDirection - sign of each motor's positive sense, default { a: 1, b: 1 }
 * @returns K [-]
 * @see I. Moyer, CoreXY (corexy.com, 2012): ΔX = ½(ΔA + ΔB), ΔY = ½(ΔA − ΔB)
 */
export function kinematicsMatrix(mechanism: Mechanism, motorDirection?: MotorDirection): Matrix2 {
  const m = checkMechanism('kinematicsMatrix', mechanism);
  const d = checkDirection('kinematicsMatrix', motorDirection);
  const base: Matrix2 =
    m === 'cartesian'
      ? [
          [1, 0],
          [0, 1],
        ]
      : [
          [1, 1],
          [1, -1],
        ];
  return [
    [d.a * base[0][0], d.a * base[0][1]],
    [d.b * base[1][0], d.b * base[1][1]],
  ];
}

/**
 * Belt displacement at each motor for a carriage displacement (inverse kinematics).
 * @param args.mechanism - "corexy" | "hbot" | "cartesian"
 * @param args.dxMm - carriage displacement along X [mm]
 * @param args.dyMm - carriage displacement along Y [mm]
 * @param args.motorDirection - optional sign convention, default { a: 1, b: 1 }
 * @returns belt displacement at motor A and B [mm]
 * @see I. Moyer, CoreXY (corexy.com, 2012): ΔA = ΔX + ΔY, ΔB = ΔX − ΔY
 */
export function carriageToMotor(args: { mechanism: Mechanism; dxMm: number; dyMm: number; motorDirection?: MotorDirection }): {
  daMm: number;
  dbMm: number;
} {
  const s = 'carriageToMotor';
  const k = kinematicsMatrix(checkMechanism(s, args?.mechanism), checkDirection(s, args?.motorDirection));
  const [da, db] = apply2(k, requireNumber(s, 'dxMm', args.dxMm), requireNumber(s, 'dyMm', args.dyMm));
  return { daMm: da, dbMm: db };
}

/**
 * Carriage displacement for a belt displacement at each motor (forward kinematics). One crossed-belt motor
 * alone moves the carriage along a 45° diagonal by ΔA/√2.
 * @param args.mechanism - "corexy" | "hbot" | "cartesian"
 * @param args.daMm - belt displacement at motor A [mm]
 * @param args.dbMm - belt displacement at motor B [mm]
 * @param args.motorDirection - optional sign convention, default { a: 1, b: 1 }
 * @returns carriage displacement along X and Y [mm]
 * @see I. Moyer, CoreXY (corexy.com, 2012): ΔX = ½(ΔA + ΔB), ΔY = ½(ΔA − ΔB)
 */
export function motorToCarriage(args: { mechanism: Mechanism; daMm: number; dbMm: number; motorDirection?: MotorDirection }): {
  dxMm: number;
  dyMm: number;
} {
  const s = 'motorToCarriage';
  const k = kinematicsMatrix(checkMechanism(s, args?.mechanism), checkDirection(s, args?.motorDirection));
  const [dx, dy] = apply2(inverse2(k), requireNumber(s, 'daMm', args.daMm), requireNumber(s, 'dbMm', args.dbMm));
  return { dxMm: dx, dyMm: dy };
}

/**
 * Force on the carriage from the belt pulls at the motors, by virtual work: [Fx, Fy]ᵀ = Kᵀ·[FA, FB]ᵀ.
 * @param args.mechanism - "corexy" | "hbot" | "cartesian"
 * @param args.forceAN - belt pull of motor A, τA/r [N]
 * @param args.forceBN - belt pull of motor B [N]
 * @param args.motorDirection - optional sign convention
 * @returns force on the carriage along X and Y [N]
 * @see docs/models/envelope.md §1 (virtual work: FA·δA + FB·δB = Fx·δX + Fy·δY for every δ)
 */
export function beltPullsToForce(args: { mechanism: Mechanism; forceAN: number; forceBN: number; motorDirection?: MotorDirection }): {
  forceXN: number;
  forceYN: number;
} {
  const s = 'beltPullsToForce';
  const k = kinematicsMatrix(checkMechanism(s, args?.mechanism), checkDirection(s, args?.motorDirection));
  const [fx, fy] = apply2(transpose2(k), requireNumber(s, 'forceAN', args.forceAN), requireNumber(s, 'forceBN', args.forceBN));
  return { forceXN: fx, forceYN: fy };
}

/**
 * Belt pulls the motors must supply for a force on the carriage: [FA, FB]ᵀ = K⁻ᵀ·[Fx, Fy]ᵀ.
 * @param args.mechanism - "corexy" | "hbot" | "cartesian"
 * @param args.forceXN - force on the carriage along X [N]
 * @param args.forceYN - force on the carriage along Y [N]
 * @param args.motorDirection - optional sign convention
 * @returns belt pull at motor A and B [N]
 */
export function forceToBeltPulls(args: { mechanism: Mechanism; forceXN: number; forceYN: number; motorDirection?: MotorDirection }): {
  forceAN: number;
  forceBN: number;
} {
  const s = 'forceToBeltPulls';
  const k = kinematicsMatrix(checkMechanism(s, args?.mechanism), checkDirection(s, args?.motorDirection));
  const [fa, fb] = apply2(inverse2(transpose2(k)), requireNumber(s, 'forceXN', args.forceXN), requireNumber(s, 'forceYN', args.forceYN));
  return { forceAN: fa, forceBN: fb };
}

/**
 * Each motor's signed share of speed and of force for a carriage move along direction θ.
 * Speed share: belt speed at the motor per unit carriage speed, K·u. Force share: belt pull per unit
 * carriage force along u, K⁻ᵀ·u. Their products sum to 1 (power balance).
 * @param k - motor-to-carriage matrix K
 * @param directionRad - direction of travel θ from +X toward +Y [rad]
 * @returns shares for motor A and B [-]
 */
export function couplingShares(k: Matrix2, directionRad: number): { speedA: number; speedB: number; forceA: number; forceB: number } {
  const c = Math.cos(directionRad);
  const s = Math.sin(directionRad);
  const [va, vb] = apply2(k, c, s);
  const [fa, fb] = apply2(inverse2(transpose2(k)), c, s);
  return { speedA: va, speedB: vb, forceA: fa, forceB: fb };
}
