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
