import { requireNumber } from './errors';

/**
 * Time of a point-to-point move with equal constant acceleration and deceleration, starting and ending at
 * rest, no jerk limit: trapezoidal t = s/v + v/a when s ≥ v²/a, otherwise triangular t = 2·√(s/a).
 * @param args.distanceMm - move length s [mm]
 * @param args.speedMmPerS - cruise speed v [mm/s]
 * @param args.accelMmPerS2 - acceleration a [mm/s²]
 * @returns move time [s]
 * @see elementary constant-acceleration kinematics (each ramp covers v²/(2a) in v/a)
 */
export function moveTimeS(args: { distanceMm: number; speedMmPerS: number; accelMmPerS2: number }): number {
  const s = requireNumber('moveTimeS', 'distanceMm', args?.distanceMm, 0);
  const v = requireNumber('moveTimeS', 'speedMmPerS', args?.speedMmPerS, 0, Infinity, true);
  const a = requireNumber('moveTimeS', 'accelMmPerS2', args?.accelMmPerS2, 0, Infinity, true);
  if (s >= (v * v) / a) return s / v + v / a;
  return 2 * Math.sqrt(s / a);
}

/**
 * Time of a point-to-point move with limited speed v, acceleration a and jerk j, starting and ending at rest
 * (symmetric S-curve). Reaching the speed v takes T_v = v/a + a/j when v ≥ a²/j (the acceleration reaches a),
 * otherwise 2·√(v/j); the ramp covers v·T_v/2. Long moves take s/v + T_v. A shorter move peaks at a lower speed
 * v_p with v_p·T(v_p) = s: v_p = (s²·j/4)^(1/3) when v_p ≤ a²/j (time (32·s/j)^(1/3)), otherwise
 * v_p = (−a²/j + √(a⁴/j² + 4·a·s))/2 (time 2·(v_p/a + a/j)).
 * @param args.distanceMm - move length s [mm]
 * @param args.speedMmPerS - speed limit v [mm/s]
 * @param args.accelMmPerS2 - acceleration limit a [mm/s²]
 * @param args.jerkMmPerS3 - jerk limit j [mm/s³]
 * @returns move time [s]
 * @see docs/models/job-timing.md (elementary kinematics of the seven-phase S-curve)
 */
export function jerkLimitedMoveTimeS(args: { distanceMm: number; speedMmPerS: number; accelMmPerS2: number; jerkMmPerS3: number }): number {
  const sc = 'jerkLimitedMoveTimeS';
  const s = requireNumber(sc, 'distanceMm', args?.distanceMm, 0);
  const v = requireNumber(sc, 'speedMmPerS', args?.speedMmPerS, 0, Infinity, true);
  const a = requireNumber(sc, 'accelMmPerS2', args?.accelMmPerS2, 0, Infinity, true);
  const j = requireNumber(sc, 'jerkMmPerS3', args?.jerkMmPerS3, 0, Infinity, true);
  return sCurveTime(s, v, a, j);
}

/** Time to reach a speed from rest under an acceleration and a jerk limit (any consistent units). */
function sCurveRampTime(peak: number, a: number, j: number): number {
  return peak >= (a * a) / j ? peak / a + a / j : 2 * Math.sqrt(peak / j);
}

/**
 * The arithmetic of {@link jerkLimitedMoveTimeS} for callers that have already checked their numbers (the job
 * scheduler calls it thousands of times per evaluation).
 * @param s - distance, v - speed limit, a - acceleration limit, j - jerk limit (any consistent units, all > 0 but s ≥ 0)
 * @returns move time
 */
export function sCurveTime(s: number, v: number, a: number, j: number): number {
  if (s === 0) return 0;
  const tv = sCurveRampTime(v, a, j);
  if (s >= v * tv) return s / v + tv;
  const vp = Math.cbrt((s * s * j) / 4);
  if (vp <= (a * a) / j) return 2 * sCurveRampTime(vp, a, j);
  const vq = (-(a * a) / j + Math.sqrt((a * a * a * a) / (j * j) + 4 * a * s)) / 2;
  return 2 * sCurveRampTime(vq, a, j);
}

/**
 * The arithmetic of {@link moveTimeS} for callers that have already checked their numbers.
 * @param s - distance, v - speed, a - acceleration (any consistent units, v and a > 0)
 * @returns move time
 */
export function trapezoidTime(s: number, v: number, a: number): number {
  return s >= (v * v) / a ? s / v + v / a : 2 * Math.sqrt(s / a);
}
