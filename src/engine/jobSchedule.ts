import { requireNumber } from './errors';
import { sCurveTime, trapezoidTime } from './moveTime';

// Job timing (docs/models/job-timing.md): a list of XY points becomes move-by-move times, each move limited by
// what the stage can do in its own direction.

/** One point of a job in travel coordinates, with the pause after arriving there. */
export interface JobPoint {
  xMm: number;
  yMm: number;
  /** Pause at the point (placing, dispensing…) [s]. */
  dwellS?: number;
}

/** What the stage can do along one direction of travel. */
export interface DirectionLimit {
  /** Highest speed along the direction [m/s]. */
  speedMPerS: number;
  /**
   * Largest constant acceleration along the direction for a ramp that ends at a speed (every motor must have the
   * torque at every speed on the way) [m/s²].
   */
  accelMPerS2(topSpeedMPerS: number): number;
}

/** The stage's limits along any direction (the acceleration/speed envelope, evaluated at any angle). */
export interface DirectionLimits {
  /** The limits along a direction [rad]; the direction's own numbers are worked out once per call. */
  along(directionRad: number): DirectionLimit;
}

/** What limited a move. */
export type MoveLimit = 'cruise speed' | 'planned acceleration' | 'motors';

/** One move of a job. */
export interface JobMove {
  fromIndex: number;
  toIndex: number;
  distanceMm: number;
  /** Direction of travel, 0° = +X, counter-clockwise [°]. */
  directionDeg: number;
  /** Move time without the dwell; null when the stage cannot move in this direction at all [s]. */
  timeS: number | null;
  /** Peak speed and acceleration of the move's profile [m/s, m/s²]. */
  peakSpeedMPerS: number;
  accelMPerS2: number;
  limitedBy: MoveLimit;
}

/** Job section of the result (docs/models/job-timing.md). */
export interface JobResult {
  /** Moves plus dwells; null when some move cannot be made [s]. */
  totalS: number | null;
  /** Time moving and time dwelling [s]. */
  moveS: number | null;
  dwellS: number;
  /** Profile used: constant acceleration, or jerk-limited when the controller sets a jerk. */
  profile: 'trapezoidal' | 'jerk-limited';
  pointCount: number;
  moves: JobMove[];
  /** Indices into `moves` of the slowest moves, slowest first (up to 5). */
  slowest: number[];
  /** Indices of points outside the travel. */
  outsideTravel: number[];
  /**
   * The same job as fast as the motors allow (no planned acceleration, no cruise speed; the controller's jerk kept):
   * what the mechanism itself could do [s].
   */
  atLimits: { totalS: number | null; moveS: number | null } | null;
}

/** Peak speeds tried per move before refining around the best. */
const SPEED_SAMPLES = 8;
/**
 * Golden-section steps of the refinement: the bracket shrinks to 0.618^24 ≈ 1e-5 of two samples; the move time is
 * flat at its minimum, so its error is of the order of the square of that.
 */
const GOLDEN_STEPS = 24;
/** Moves listed as the slowest. */
const SLOWEST_COUNT = 5;

/**
 * Time of one move: the profile's peak speed is chosen up to the lower of the cruise speed and the direction's
 * top speed so that the move is quickest, the acceleration being the planned one capped by what the motors give
 * on the way to that speed (with a fixed acceleration the quickest is always the highest speed).
 */
function timeMove(
  s: number,
  theta: number,
  limits: DirectionLimits,
  cruise: number,
  planned: number | null,
  jerk: number | null,
): { timeS: number | null; peak: number; accel: number; limitedBy: MoveLimit } {
  const along = limits.along(theta);
  const vTop = Math.min(cruise, along.speedMPerS);
  const byMotors = vTop < cruise;
  const accelFor = (v: number) => Math.min(planned ?? Infinity, along.accelMPerS2(v));
  const timeFor = (v: number): number => {
    const a = accelFor(v);
    if (!(a > 0) || !(v > 0)) return Infinity;
    return jerk ? sCurveTime(s, v, a, jerk) : trapezoidTime(s, v, a);
  };
  // Whether the profile reaches its peak speed (then the speed limit binds) or turns back before (the acceleration).
  const reaches = (v: number, a: number) =>
    jerk ? s >= v * (v >= (a * a) / jerk ? v / a + a / jerk : 2 * Math.sqrt(v / jerk)) : s >= (v * v) / a;
  const what = (v: number, a: number): MoveLimit => {
    if (reaches(v, a)) return v >= vTop && !byMotors ? 'cruise speed' : 'motors';
    return planned !== null && a >= planned ? 'planned acceleration' : 'motors';
  };
  // The speed the profile actually peaks at (below v when the move is too short to reach it).
  const peakOf = (v: number, a: number): number => {
    if (reaches(v, a)) return v;
    if (!jerk) return Math.sqrt(a * s);
    const vp = Math.cbrt((s * s * jerk) / 4);
    return vp <= (a * a) / jerk ? vp : (-(a * a) / jerk + Math.sqrt((a * a * a * a) / (jerk * jerk) + 4 * a * s)) / 2;
  };
  if (!(vTop > 0)) return { timeS: null, peak: 0, accel: 0, limitedBy: 'motors' };
  const aTop = accelFor(vTop);
  if (planned !== null && aTop >= planned) {
    return { timeS: timeFor(vTop), peak: peakOf(vTop, planned), accel: planned, limitedBy: what(vTop, planned) };
  }
  // The motors' acceleration falls with speed: look for the quickest peak speed, then refine around it.
  let best = { v: vTop, t: timeFor(vTop) };
  for (let k = 1; k < SPEED_SAMPLES; k++) {
    const v = (vTop * k) / SPEED_SAMPLES;
    const t = timeFor(v);
    if (t < best.t) best = { v, t };
  }
  // Golden-section search in the bracket around the best sample (one new evaluation per step).
  let lo = Math.max(1e-9, best.v - vTop / SPEED_SAMPLES);
  let hi = Math.min(vTop, best.v + vTop / SPEED_SAMPLES);
  const g = (Math.sqrt(5) - 1) / 2;
  let m1 = hi - g * (hi - lo);
  let m2 = lo + g * (hi - lo);
  let t1 = timeFor(m1);
  let t2 = timeFor(m2);
  for (let i = 0; i < GOLDEN_STEPS; i++) {
    if (t1 <= t2) {
      hi = m2;
      m2 = m1;
      t2 = t1;
      m1 = hi - g * (hi - lo);
      t1 = timeFor(m1);
    } else {
      lo = m1;
      m1 = m2;
      t1 = t2;
      m2 = lo + g * (hi - lo);
      t2 = timeFor(m2);
    }
  }
  const v = (lo + hi) / 2;
  const t = timeFor(v) <= best.t ? { v, t: timeFor(v) } : best;
  if (!Number.isFinite(t.t)) return { timeS: null, peak: 0, accel: 0, limitedBy: 'motors' };
  const a = accelFor(t.v);
  return { timeS: t.t, peak: peakOf(t.v, a), accel: a, limitedBy: what(t.v, a) };
}

/**
 * Times a job move by move: each move from one point to the next gets a trapezoidal (or, with a jerk, an
 * S-curve) profile using its own direction's limits, every point its dwell. Reports the total cycle time, the
 * slowest moves and the points that lie outside the travel.
 * @param args.points - job points in travel coordinates [mm, s]
 * @param args.limits - the stage's limits along any direction
 * @param args.cruiseSpeedMPerS - speed the designer plans to run at (the ceiling of every move) [m/s]
 * @param args.plannedAccelMPerS2 - acceleration the designer plans (null: as much as the motors give) [m/s²]
 * @param args.jerkMPerS3 - jerk limit of the controller (null: none) [m/s³]
 * @param args.travel - usable travel [mm]
 * @returns the job section
 * @see docs/models/job-timing.md
 */
export function scheduleJob(args: {
  points: readonly JobPoint[];
  limits: DirectionLimits;
  cruiseSpeedMPerS: number;
  plannedAccelMPerS2: number | null;
  jerkMPerS3: number | null;
  travel: { xMm: number; yMm: number };
}): JobResult {
  const sc = 'scheduleJob';
  const cruise = requireNumber(sc, 'cruiseSpeedMPerS', args.cruiseSpeedMPerS, 0, Infinity, true);
  const pts = args.points;
  const moves: JobMove[] = [];
  let moveS: number | null = 0;
  for (let i = 0; i + 1 < pts.length; i++) {
    const dx = pts[i + 1].xMm - pts[i].xMm;
    const dy = pts[i + 1].yMm - pts[i].yMm;
    const dist = Math.hypot(dx, dy);
    const theta = Math.atan2(dy, dx);
    const deg = dist > 0 ? ((theta * 180) / Math.PI + 360) % 360 : 0;
    const m =
      dist > 0
        ? timeMove(dist / 1000, theta, args.limits, cruise, args.plannedAccelMPerS2, args.jerkMPerS3)
        : { timeS: 0, peak: 0, accel: 0, limitedBy: 'cruise speed' as MoveLimit };
    moves.push({
      fromIndex: i,
      toIndex: i + 1,
      distanceMm: dist,
      directionDeg: deg,
      timeS: m.timeS,
      peakSpeedMPerS: m.peak,
      accelMPerS2: m.accel,
      limitedBy: m.limitedBy,
    });
    moveS = moveS === null || m.timeS === null ? null : moveS + m.timeS;
  }
  const dwellS = pts.reduce((sum, p) => sum + (p.dwellS ?? 0), 0);
  const slowest = moves
    .map((m, i) => ({ i, t: m.timeS === null ? Infinity : m.timeS }))
    .filter((x) => x.t > 0)
    .sort((a, b) => b.t - a.t || a.i - b.i)
    .slice(0, SLOWEST_COUNT)
    .map((x) => x.i);
  const eps = 1e-6;
  const outsideTravel = pts
    .map((p, i) => (p.xMm < -eps || p.yMm < -eps || p.xMm > args.travel.xMm + eps || p.yMm > args.travel.yMm + eps ? i : -1))
    .filter((i) => i >= 0);
  return {
    totalS: moveS === null ? null : moveS + dwellS,
    moveS,
    dwellS,
    profile: args.jerkMPerS3 ? 'jerk-limited' : 'trapezoidal',
    pointCount: pts.length,
    moves,
    slowest,
    outsideTravel,
    atLimits: null,
  };
}
