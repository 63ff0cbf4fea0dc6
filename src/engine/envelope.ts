import { inverse2, transpose2, type Matrix2 } from './linalg';

/**
 * Belt pull a motor coordinate can deliver at a belt speed [N], margin and motor count included, and the belt
 * speed where it ends. Sampled once per design so the 360 directions share the work.
 */
export interface PullCurve {
  /** Belt speeds of the samples, 0 … top [m/s]. */
  beltSpeedMPerS: Float64Array;
  /** Available pull at each sample [N]. */
  pullN: Float64Array;
  /** Running minimum of pullN: what the motor still has at every speed on the way up to this one [N]. */
  pullFloorN: Float64Array;
  /** Highest belt speed sampled; no pull beyond it [m/s]. */
  topMPerS: number;
}

/**
 * Samples a pull function on [0, top] for the envelope.
 * @param pullAt - available belt pull at a belt speed [N at m/s]
 * @param topMPerS - belt speed from which the pull is taken as zero (model tail, table end or speed limit) [m/s]
 * @param samples - number of samples (≥ 2)
 * @returns the sampled curve
 */
export function samplePullCurve(pullAt: (beltSpeedMPerS: number) => number, topMPerS: number, samples = 513): PullCurve {
  const n = Math.max(2, samples);
  const v = new Float64Array(n);
  const p = new Float64Array(n);
  const floor = new Float64Array(n);
  let min = Infinity;
  for (let i = 0; i < n; i++) {
    v[i] = (topMPerS * i) / (n - 1);
    p[i] = Math.max(0, i === n - 1 ? Math.min(pullAt(v[i]), pullAt(topMPerS * (1 - 1e-12))) : pullAt(v[i]));
    min = Math.min(min, p[i]);
    floor[i] = min;
  }
  return { beltSpeedMPerS: v, pullN: p, pullFloorN: floor, topMPerS };
}

/**
 * A pull curve multiplied by a factor (e.g. the number of motors on one coordinate).
 * @param c - sampled pull curve
 * @param factor - multiplier [-]
 * @returns the scaled curve (the input is not changed)
 */
export function scalePullCurve(c: PullCurve, factor: number): PullCurve {
  if (factor === 1) return c;
  // Plain loops: a typed array's map with a callback costs several times the products.
  const n = c.pullN.length;
  const pullN = new Float64Array(n);
  const pullFloorN = new Float64Array(c.pullFloorN.length);
  for (let i = 0; i < n; i++) pullN[i] = c.pullN[i] * factor;
  for (let i = 0; i < pullFloorN.length; i++) pullFloorN[i] = c.pullFloorN[i] * factor;
  return { beltSpeedMPerS: c.beltSpeedMPerS, pullN, pullFloorN, topMPerS: c.topMPerS };
}

/**
 * Highest belt speed at which the pull floor still covers a need (linear interpolation between samples).
 * @param c - sampled pull curve
 * @param needN - pull needed at constant speed (friction share) [N]
 * @returns belt speed [m/s]; 0 when even standstill does not cover the need
 */
export function beltSpeedForPull(c: PullCurve, needN: number): number {
  const f = c.pullFloorN;
  const n = f.length;
  if (f[0] < needN) return 0;
  if (f[n - 1] >= needN) return c.topMPerS;
  // pullFloor is non-increasing: binary search the last sample still covering the need.
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (f[mid] >= needN) lo = mid;
    else hi = mid;
  }
  const t = f[lo] === f[hi] ? 0 : (f[lo] - needN) / (f[lo] - f[hi]);
  return c.beltSpeedMPerS[lo] + t * (c.beltSpeedMPerS[hi] - c.beltSpeedMPerS[lo]);
}

/**
 * Pull available at a belt speed (linear interpolation between samples; zero beyond the top).
 * @param c - sampled pull curve
 * @param beltSpeedMPerS - belt speed [m/s]
 * @returns pull [N]
 */
export function pullAtSpeed(c: PullCurve, beltSpeedMPerS: number): number {
  const v = Math.abs(beltSpeedMPerS);
  if (v >= c.topMPerS) return v === c.topMPerS ? c.pullN[c.pullN.length - 1] : 0;
  const x = (v / c.topMPerS) * (c.pullN.length - 1);
  const i = Math.floor(x);
  const t = x - i;
  return c.pullN[i] + t * (c.pullN[i + 1] - c.pullN[i]);
}

/** What the envelope needs to know about a design, in SI units. */
export interface EnvelopeInput {
  /** Motor-to-carriage matrix K. */
  k: Matrix2;
  /** Moving mass along X and Y [kg]. */
  xKg: number;
  yKg: number;
  /** Equivalent mass each motor coordinate accelerates at belt speed (rotor, pulleys, idlers, belt) [kg]. */
  motorEquivalentKg: [number, number];
  /** Part of motorEquivalentKg that the belt itself carries (belt and idlers, not the rotor or drive pulley) [kg]. */
  beltCarriedKg: [number, number];
  /** Coulomb friction of the X and Y guides [N]. */
  frictionXN: number;
  frictionYN: number;
  /** Available pull of each motor coordinate. */
  pull: [PullCurve, PullCurve];
  /** Cruise speed of the carriage [m/s]. */
  cruiseMPerS: number;
  /** Number of directions over the full turn. */
  directions: number;
}

/** Acceleration and speed limits over all directions. */
export interface EnvelopeResult {
  directionsDeg: number[];
  accelMaxMPerS2: number[];
  accelAtCruiseMPerS2: number[];
  speedMaxMPerS: number[];
  /** Motor that limits the acceleration at rest ("A" or "B"). */
  limitingMotor: ('A' | 'B')[];
  /** Signed speed share K·u and force share K⁻ᵀ·u of each motor per direction. */
  speedShareA: number[];
  speedShareB: number[];
  forceShareA: number[];
  forceShareB: number[];
  /** Largest belt pull each motor coordinate transmits anywhere on the envelope [N]. */
  peakBeltPullN: [number, number];
  /** Largest X force the belts put on the carriage anywhere on the envelope [N]. */
  peakForceXN: number;
  /**
   * Signed belt pulls of both coordinates at every envelope point: per direction, accelerating and braking at the
   * limit at rest and at cruise (4 per direction), belt and idler inertia included (docs/models/belt-tension.md §4).
   */
  pullPairs: { aN: Float64Array; bN: Float64Array; directionDeg: Float64Array };
}

function accelBound(alpha: number, beta: number, p: number): number {
  if (alpha === 0) return Infinity;
  return (p - Math.sign(alpha) * beta) / Math.abs(alpha);
}

/** Acceleration limit of one direction at given available pulls, and the motor that sets it. */
interface RestLimit {
  accel: number;
  motor: 'A' | 'B';
}

/**
 * The acceleration both motors allow with available pulls pA, pB (each pull affine in a: α·a + β); 0 when a motor
 * cannot even hold its friction share, the one short by more then limiting. Written into `out` (no allocation:
 * the envelope calls this twice per direction).
 */
function restLimit(pA: number, pB: number, alphaA: number, betaA: number, alphaB: number, betaB: number, out: RestLimit): void {
  if (Math.abs(betaA) > pA || Math.abs(betaB) > pB) {
    out.accel = 0;
    out.motor = Math.abs(betaA) - pA >= Math.abs(betaB) - pB ? 'A' : 'B';
    return;
  }
  const ba = accelBound(alphaA, betaA, pA);
  const bb = accelBound(alphaB, betaB, pB);
  out.accel = ba <= bb ? Math.max(0, ba) : Math.max(0, bb);
  out.motor = ba <= bb ? 'A' : 'B';
}

/**
 * Acceleration and speed envelope. For direction u = (cos θ, sin θ) and acceleration a the
 * carriage needs F = diag(m_x, m_y)·u·a + friction (each guide's friction opposes its own motion), the motors
 * pull K⁻ᵀ·F and also accelerate their own equivalent mass at (K·u)·a. Each motor's pull is affine in a,
 * αᵢ·a + βᵢ, and must stay within ±Pᵢ(speed), so a_max = minᵢ (Pᵢ − sign(αᵢ)·βᵢ)/|αᵢ|. v_max is the speed up to
 * which every motor still covers its friction share βᵢ.
 * @param inp - matrix, masses [kg], friction [N], pull curves, cruise speed [m/s], number of directions
 * @returns per-direction limits [m/s², m/s], shares and the limiting motor
 * @see docs/models/envelope.md; virtual work for K⁻ᵀ (docs/models/envelope.md §1)
 */
export function computeEnvelope(inp: EnvelopeInput): EnvelopeResult {
  const n = inp.directions;
  const kit = inverse2(transpose2(inp.k));
  // Empty arrays filled in order stay packed (new Array(n) would leave them holey, which V8's JSON encoder writes
  // about 30 % slower); see src/engine/zeroRow.ts.
  const out: EnvelopeResult = {
    directionsDeg: [],
    accelMaxMPerS2: [],
    accelAtCruiseMPerS2: [],
    speedMaxMPerS: [],
    limitingMotor: [],
    speedShareA: [],
    speedShareB: [],
    forceShareA: [],
    forceShareB: [],
    peakBeltPullN: [0, 0],
    peakForceXN: 0,
    pullPairs: { aN: new Float64Array(4 * n), bN: new Float64Array(4 * n), directionDeg: new Float64Array(4 * n) },
  };
  const pp = out.pullPairs;
  const [pa, pb] = inp.pull;
  const pa0 = pa.pullN[0];
  const pb0 = pb.pullN[0];
  const limit: RestLimit = { accel: 0, motor: 'A' };
  for (let i = 0; i < n; i++) {
    const deg = (360 * i) / n;
    // Angles past 180° are taken as negative so that θ and −θ give bit-identical cosines.
    const th = ((deg > 180 ? deg - 360 : deg) * Math.PI) / 180;
    // Exact zeros on the axes keep mirror-symmetric designs exactly symmetric.
    const c = i % (n / 4) === 0 && n % 4 === 0 ? [1, 0, -1, 0][i / (n / 4)] : Math.cos(th);
    const s = i % (n / 4) === 0 && n % 4 === 0 ? [0, 1, 0, -1][i / (n / 4)] : Math.sin(th);
    const sa = inp.k[0][0] * c + inp.k[0][1] * s;
    const sb = inp.k[1][0] * c + inp.k[1][1] * s;
    const fa = kit[0][0] * c + kit[0][1] * s;
    const fb = kit[1][0] * c + kit[1][1] * s;
    // Carriage-side force per unit acceleration, and friction (opposing motion along each guide).
    const mx = inp.xKg * c;
    const my = inp.yKg * s;
    const fx = inp.frictionXN * Math.sign(c);
    const fy = inp.frictionYN * Math.sign(s);
    const carA = kit[0][0] * mx + kit[0][1] * my;
    const carB = kit[1][0] * mx + kit[1][1] * my;
    const alphaA = carA + inp.motorEquivalentKg[0] * sa;
    const alphaB = carB + inp.motorEquivalentKg[1] * sb;
    const betaA = kit[0][0] * fx + kit[0][1] * fy;
    const betaB = kit[1][0] * fx + kit[1][1] * fy;

    // Speed limit: every motor covers its friction share at its own belt speed.
    const absSa = Math.abs(sa);
    const absSb = Math.abs(sb);
    let vmax = Infinity;
    if (absSa > 1e-12) vmax = Math.min(vmax, beltSpeedForPull(pa, Math.abs(betaA)) / absSa);
    else if (Math.abs(betaA) > pa0) vmax = 0;
    if (absSb > 1e-12) vmax = Math.min(vmax, beltSpeedForPull(pb, Math.abs(betaB)) / absSb);
    else if (Math.abs(betaB) > pb0) vmax = 0;

    restLimit(pa0, pb0, alphaA, betaA, alphaB, betaB, limit);
    const a0 = limit.accel;
    const lim = limit.motor;
    let aCruise = 0;
    if (inp.cruiseMPerS <= vmax) {
      restLimit(pullAtSpeed(pa, absSa * inp.cruiseMPerS), pullAtSpeed(pb, absSb * inp.cruiseMPerS), alphaA, betaA, alphaB, betaB, limit);
      aCruise = limit.accel;
    }
    // Belt pulls at the limits: the carriage-side force plus what the belt itself (and its idlers) carries.
    // Braking at the same rate (friction then helps) is kept too: its pulls belong to the same envelope.
    const beltA = carA + inp.beltCarriedKg[0] * sa;
    const beltB = carB + inp.beltCarriedKg[1] * sb;
    for (let q = 0; q < 4; q++) {
      const a = q < 2 ? a0 : aCruise;
      const sgn = q % 2 === 0 ? 1 : -1;
      const pullA = sgn * beltA * a + betaA;
      const pullB = sgn * beltB * a + betaB;
      pp.aN[4 * i + q] = pullA;
      pp.bN[4 * i + q] = pullB;
      pp.directionDeg[4 * i + q] = deg;
      if (Math.abs(pullA) > out.peakBeltPullN[0]) out.peakBeltPullN[0] = Math.abs(pullA);
      if (Math.abs(pullB) > out.peakBeltPullN[1]) out.peakBeltPullN[1] = Math.abs(pullB);
      const fX = Math.abs(sgn * mx * a + fx);
      if (fX > out.peakForceXN) out.peakForceXN = fX;
    }
    out.directionsDeg[i] = deg;
    out.accelMaxMPerS2[i] = a0;
    out.accelAtCruiseMPerS2[i] = aCruise;
    out.speedMaxMPerS[i] = Number.isFinite(vmax) ? vmax : 0;
    out.limitingMotor[i] = lim;
    out.speedShareA[i] = sa;
    out.speedShareB[i] = sb;
    out.forceShareA[i] = fa;
    out.forceShareB[i] = fb;
  }
  return out;
}

/**
 * Force each motor coordinate must produce at its pulley (belt pull plus its own equivalent mass times belt
 * acceleration), for one direction and acceleration at constant friction.
 * @param inp - envelope input
 * @param directionRad - direction θ [rad]
 * @param accelMPerS2 - carriage acceleration along θ [m/s²]
 * @returns signed force at motor A and B [N]
 */
export function motorForcesN(inp: EnvelopeInput, directionRad: number, accelMPerS2: number): [number, number] {
  return motorForcesWithKit(inp, inverse2(transpose2(inp.k)), directionRad, accelMPerS2);
}

/**
 * {@link motorForcesN} with K⁻ᵀ worked out once by the caller (loops over many directions).
 * @param inp - envelope input
 * @param kit - inverse2(transpose2(inp.k))
 * @param directionRad - direction θ [rad]
 * @param accelMPerS2 - carriage acceleration along θ [m/s²]
 * @returns signed force at motor A and B [N]
 */
export function motorForcesWithKit(inp: EnvelopeInput, kit: Matrix2, directionRad: number, accelMPerS2: number): [number, number] {
  const c = Math.cos(directionRad);
  const s = Math.sin(directionRad);
  const ec = Math.abs(c) < 1e-12 ? 0 : c;
  const es = Math.abs(s) < 1e-12 ? 0 : s;
  const fx = inp.xKg * ec * accelMPerS2 + inp.frictionXN * Math.sign(ec);
  const fy = inp.yKg * es * accelMPerS2 + inp.frictionYN * Math.sign(es);
  const sa = inp.k[0][0] * ec + inp.k[0][1] * es;
  const sb = inp.k[1][0] * ec + inp.k[1][1] * es;
  return [
    kit[0][0] * fx + kit[0][1] * fy + inp.motorEquivalentKg[0] * sa * accelMPerS2,
    kit[1][0] * fx + kit[1][1] * fy + inp.motorEquivalentKg[1] * sb * accelMPerS2,
  ];
}
