import { qty, renderQuantity } from './checkText';
import { requireNumber } from './errors';
import { sampledGridMap } from './gridSampling';
import type { Matrix2 } from './linalg';
import type { CheckQuantity } from './types';

// Positioning-error budget (docs/models/error-budget.md): belt stretch under load, the motors' load angle, the
// microstep deadband from friction and the periodic error of an eccentric drive pulley, over the travel grid.

/**
 * Lag of a hybrid stepper's rotor behind its commanded position under a load torque, as belt travel: the torque
 * follows τ = T·sin(N_r·δ) near a detent, so δ = asin(τ/T)/N_r and the belt lags r·δ. A load at or above T pulls
 * the rotor out of step; the figure is then capped at a quarter of a tooth pitch (δ = π/(2·N_r)).
 * @param args.torqueNm - load torque on the shaft τ [N·m]
 * @param args.holdingTorqueNm - holding torque at the driven current T [N·m]
 * @param args.rotorTeeth - rotor teeth N_r (50 for 1.8°) [-]
 * @param args.pulleyRadiusMm - pitch radius of the drive pulley r [mm]
 * @returns belt lag [mm] (sign of the torque)
 * @see P. P. Acarnley, Stepping Motors, 4th ed., static torque–displacement characteristic (from memory);
 *   docs/models/error-budget.md
 */
export function loadAngleErrorMm(args: { torqueNm: number; holdingTorqueNm: number; rotorTeeth: number; pulleyRadiusMm: number }): number {
  const s = 'loadAngleErrorMm';
  const tau = requireNumber(s, 'torqueNm', args?.torqueNm);
  const t = requireNumber(s, 'holdingTorqueNm', args?.holdingTorqueNm, 0, Infinity, true);
  const nr = requireNumber(s, 'rotorTeeth', args?.rotorTeeth, 0, Infinity, true);
  const r = requireNumber(s, 'pulleyRadiusMm', args?.pulleyRadiusMm, 0, Infinity, true);
  return loadAngleLagMm(tau, t, nr, r);
}

/**
 * {@link loadAngleErrorMm} for arguments already known to be valid (a finite torque; a positive, finite holding
 * torque, rotor teeth count and radius): the same arithmetic without the checks or an argument object, for loops
 * over many directions. Callers check validity first and call loadAngleErrorMm otherwise, so bad input still
 * raises its error.
 * @param torqueNm - load torque τ [N·m]
 * @param holdingTorqueNm - holding torque T [N·m]
 * @param rotorTeeth - rotor teeth N_r [-]
 * @param pulleyRadiusMm - drive pulley pitch radius r [mm]
 * @returns belt lag [mm]
 */
export function loadAngleLagMm(torqueNm: number, holdingTorqueNm: number, rotorTeeth: number, pulleyRadiusMm: number): number {
  const ratio = Math.max(-1, Math.min(1, torqueNm / holdingTorqueNm));
  return (pulleyRadiusMm * Math.asin(ratio)) / rotorTeeth;
}

/** The microstep deadband of one motor. */
export interface Deadband {
  /** Half-width of the band of rest positions, as belt travel [mm]. */
  deadbandMm: number;
  /** The same band in microsteps: how many microsteps the command can move before the rotor follows [-]. */
  microsteps: number;
  /** Torque step of one microstep near the detent, T·sin(π/(2·µ)) [N·m]. */
  torquePerMicrostepNm: number;
  /** True when one microstep's torque step overcomes the friction, so single microsteps move the carriage. */
  isSingleMicrostepEffective: boolean;
}

/**
 * Microstep deadband: friction τ_f holds the rotor still until the commanded field leads it by the electrical angle
 * ψ with T·sin ψ = τ_f, so after a move the rotor rests anywhere within ±ψ of its command: ±r·ψ/N_r of belt.
 * One microstep advances the field by π/(2·µ) electrical, a torque step of about T·sin(π/(2·µ)); when that is
 * below the friction torque, single microsteps do not move the carriage.
 * @param args.frictionTorqueNm - friction torque at the motor shaft τ_f [N·m]
 * @param args.holdingTorqueNm - holding torque at the driven current T [N·m]
 * @param args.rotorTeeth - rotor teeth N_r [-]
 * @param args.microsteps - microsteps per full step µ [-]
 * @param args.pulleyRadiusMm - pitch radius of the drive pulley r [mm]
 * @returns the deadband
 * @see docs/models/error-budget.md
 */
export function microstepDeadband(args: {
  frictionTorqueNm: number;
  holdingTorqueNm: number;
  rotorTeeth: number;
  microsteps: number;
  pulleyRadiusMm: number;
}): Deadband {
  const s = 'microstepDeadband';
  const tf = Math.abs(requireNumber(s, 'frictionTorqueNm', args?.frictionTorqueNm));
  const t = requireNumber(s, 'holdingTorqueNm', args?.holdingTorqueNm, 0, Infinity, true);
  const nr = requireNumber(s, 'rotorTeeth', args?.rotorTeeth, 0, Infinity, true);
  const mu = requireNumber(s, 'microsteps', args?.microsteps, 1);
  const r = requireNumber(s, 'pulleyRadiusMm', args?.pulleyRadiusMm, 0, Infinity, true);
  const psi = Math.asin(Math.min(1, tf / t));
  const perMicro = t * Math.sin(Math.PI / (2 * mu));
  return {
    deadbandMm: (r * psi) / nr,
    microsteps: psi / (Math.PI / (2 * mu)),
    torquePerMicrostepNm: perMicro,
    isSingleMicrostepEffective: perMicro > tf,
  };
}

/**
 * Largest carriage displacement two motors' belt errors of given sizes can make, whatever their signs:
 * max |K⁻¹·(±e_a, ±e_b)|.
 * @param kinv - K⁻¹, belt displacement at the motors → carriage displacement
 * @param aMm - size of motor A's belt error [mm]
 * @param bMm - size of motor B's belt error [mm]
 * @returns carriage error [mm]
 */
export function carriageErrorMm(kinv: Matrix2, aMm: number, bMm: number): number {
  const a = Math.abs(aMm);
  const b = Math.abs(bMm);
  const p = Math.hypot(kinv[0][0] * a + kinv[0][1] * b, kinv[1][0] * a + kinv[1][1] * b);
  const q = Math.hypot(kinv[0][0] * a - kinv[0][1] * b, kinv[1][0] * a - kinv[1][1] * b);
  return Math.max(p, q);
}

/** Names of the budget's terms. */
export type ErrorTerm = 'stretch' | 'loadAngle' | 'deadband' | 'runout';

/** Error budget at one point and direction [mm]. */
export interface ErrorBudgetPoint {
  stretchMm: number;
  loadAngleMm: number;
  deadbandMm: number;
  runoutMm: number;
  totalMm: number;
  xMm: number;
  yMm: number;
  directionDeg: number;
}

/** Error-budget section of the result (docs/models/error-budget.md). */
export interface ErrorBudgetResult {
  /** The point and direction where the total is largest, with each term there. */
  worst: ErrorBudgetPoint;
  /** Largest total over the directions at each grid point, [iy][ix] [mm]. */
  totalMm: number[][];
  /** The largest term at the worst point and what halves it: `message` in metric, `parts` for any unit system. */
  biggest: { term: ErrorTerm; message: string; parts: (string | CheckQuantity)[] };
  /** Acceleration the budget is taken at (the planned one, or the worst direction's limit) [m/s²]. */
  accelMPerS2: number;
  /** Single microsteps move the carriage on every motor. */
  isSingleMicrostepEffective: boolean;
  /** Period of the runout error along the belt: one pulley turn [mm]. */
  runoutPeriodMm: number;
}

/** What the budget over the grid needs, SI unless the name says otherwise. */
export interface ErrorBudgetInput {
  xMm: number[];
  yMm: number[];
  /** Carriage stiffness (belts and motors in series) at each grid point, flat [iy·nx + ix] [N/m]. */
  kxxNPerM: Float64Array;
  kxyNPerM: Float64Array;
  kyyNPerM: Float64Array;
  /** Compliance the motors' holding stiffness adds, K⁻¹·D·K⁻ᵀ (D = belt-line motor compliance) [m/N]. */
  motorComplianceMPerN: Matrix2;
  /** Budget directions [°] with the carriage force [N] and the load-angle carriage error [mm] along each. */
  directionsDeg: number[];
  forceXN: number[];
  forceYN: number[];
  loadAngleMm: number[];
  deadbandMm: number;
  runoutMm: number;
  /** Every how many directions the map samples (the worst point is then checked in every direction). */
  mapStride: number;
  /** Every how many grid points the map is evaluated exactly, interpolated in between (default 1: all). */
  gridStride?: number;
}

/**
 * Evaluates the error budget over the grid: at each point and direction the belt stretch C_belt·F with
 * C_belt = K_c⁻¹ − K⁻¹·D·K⁻ᵀ (the carriage compliance without the motors' share), plus the direction's load-angle
 * error, the deadband and the runout, added as a worst-case stack. |C_belt·F|² = Fᵀ(C_beltᵀC_belt)F is a quadratic
 * form with three coefficients per point, so a point costs three products per direction.
 * @param inp - grid, stiffness per point, forces and terms per direction
 * @returns the worst point with its terms and the map of the worst total per point [mm]
 * @see docs/models/error-budget.md
 */
export function errorBudgetMap(
  inp: ErrorBudgetInput,
): Omit<ErrorBudgetResult, 'biggest' | 'accelMPerS2' | 'isSingleMicrostepEffective' | 'runoutPeriodMm'> {
  const nx = inp.xMm.length;
  const ny = inp.yMm.length;
  const nd = inp.directionsDeg.length;
  const stride = Math.max(1, Math.floor(inp.mapStride));
  // When every direction's opposite has the opposite force and the same load-angle error (a symmetric stage), the
  // map need only look at half the turn: |C·F| is even in F.
  const half = nd % 2 === 0 ? nd / 2 : 0;
  let isSymmetric = half > 0;
  for (let i = 0; isSymmetric && i < half; i++) {
    const j = i + half;
    const scale = Math.abs(inp.forceXN[i]) + Math.abs(inp.forceYN[i]) + 1e-12;
    isSymmetric =
      Math.abs(inp.forceXN[i] + inp.forceXN[j]) <= 1e-9 * scale &&
      Math.abs(inp.forceYN[i] + inp.forceYN[j]) <= 1e-9 * scale &&
      Math.abs(inp.loadAngleMm[i] - inp.loadAngleMm[j]) <= 1e-9 * (Math.abs(inp.loadAngleMm[i]) + 1e-12);
  }
  const idx: number[] = [];
  for (let i = 0; i < (isSymmetric ? half : nd); i += stride) idx.push(i);
  const m = idx.length;
  const fa = new Float64Array(m);
  const fb = new Float64Array(m);
  const fc = new Float64Array(m);
  const la = new Float64Array(m);
  idx.forEach((i, j) => {
    fa[j] = inp.forceXN[i] * inp.forceXN[i];
    fb[j] = 2 * inp.forceXN[i] * inp.forceYN[i];
    fc[j] = inp.forceYN[i] * inp.forceYN[i];
    la[j] = inp.loadAngleMm[i];
  });
  const cm = inp.motorComplianceMPerN;
  const fixed = inp.deadbandMm + inp.runoutMm;
  // Belt compliance at a point (symmetric 2 × 2, m/N).
  const compliance = (p: number): [number, number, number] => {
    const a = inp.kxxNPerM[p];
    const b = inp.kxyNPerM[p];
    const d = inp.kyyNPerM[p];
    const det = a * d - b * b;
    return [d / det - cm[0][0], -b / det - (cm[0][1] + cm[1][0]) / 2, a / det - cm[1][1]];
  };
  const cm00 = cm[0][0];
  const cm11 = cm[1][1];
  const cmOff = (cm[0][1] + cm[1][0]) / 2;
  const { kxxNPerM: kxx, kxyNPerM: kxy, kyyNPerM: kyy } = inp;
  const pointTotal = (ix: number, iy: number): number => {
    // The compliance as `compliance` gives it, in scalars (the map calls this at every sampled point).
    const p = iy * nx + ix;
    const a = kxx[p];
    const b = kxy[p];
    const d = kyy[p];
    const det = a * d - b * b;
    const c11 = d / det - cm00;
    const c12 = -b / det - cmOff;
    const c22 = a / det - cm11;
    // Coefficients of |C·F|² in mm² (C in m/N → ×1e6).
    const g11 = (c11 * c11 + c12 * c12) * 1e6;
    const g12 = c12 * (c11 + c22) * 1e6;
    const g22 = (c12 * c12 + c22 * c22) * 1e6;
    let best = 0;
    for (let j = 0; j < m; j++) {
      // A positive semi-definite form: round-off may give −0 or a NaN that simply loses the comparison.
      const t = Math.sqrt(g11 * fa[j] + g12 * fb[j] + g22 * fc[j]) + la[j];
      if (t > best) best = t;
    }
    return best + fixed;
  };
  const sampled = sampledGridMap(nx, ny, Math.max(1, Math.floor(inp.gridStride ?? 1)), pointTotal, 'max');
  const totalMm = sampled.values;
  const worstP = sampled.iy * nx + sampled.ix;
  // At the worst point, every direction.
  const [c11, c12, c22] = compliance(worstP);
  let worst: ErrorBudgetPoint | null = null;
  for (let i = 0; i < nd; i++) {
    const fx = inp.forceXN[i];
    const fy = inp.forceYN[i];
    const stretch = Math.hypot(c11 * fx + c12 * fy, c12 * fx + c22 * fy) * 1000;
    const total = stretch + inp.loadAngleMm[i] + fixed;
    if (!worst || total > worst.totalMm) {
      worst = {
        stretchMm: stretch,
        loadAngleMm: inp.loadAngleMm[i],
        deadbandMm: inp.deadbandMm,
        runoutMm: inp.runoutMm,
        totalMm: total,
        xMm: inp.xMm[worstP % nx],
        yMm: inp.yMm[Math.floor(worstP / nx)],
        directionDeg: inp.directionsDeg[i],
      };
    }
  }
  const w = worst!;
  // The map's point keeps its full-direction total, so map and table agree where they meet.
  totalMm[Math.floor(worstP / nx)][worstP % nx] = Math.max(totalMm[Math.floor(worstP / nx)][worstP % nx], w.totalMm);
  return { worst: w, totalMm };
}

/**
 * The largest term at the worst point and, in plain words, what halves it: belt stretch ∝ F/EA, load angle
 * ≈ τ/(N_r·T), deadband ≈ τ_f/(N_r·T), runout ∝ eccentricity.
 * @param w - the worst point's terms [mm]
 * @param d - the design values the advice names
 * @returns the term and a sentence with the values to change
 * @see docs/models/error-budget.md
 */
export function biggestErrorTerm(
  w: ErrorBudgetPoint,
  d: { axialStiffnessN: number; accelMPerS2: number; holdingTorqueNm: number; frictionXN: number; frictionYN: number; runoutMm: number },
): ErrorBudgetResult['biggest'] {
  const terms: [ErrorTerm, number][] = [
    ['stretch', w.stretchMm],
    ['loadAngle', w.loadAngleMm],
    ['deadband', w.deadbandMm],
    ['runout', w.runoutMm],
  ];
  const [term, size] = terms.reduce((a, b) => (b[1] > a[1] ? b : a));
  const half = size / 2;
  const mm = (v: number) => qty(v, 'lengthMm');
  const partsOf: Record<ErrorTerm, CheckParts> = {
    stretch: [
      'Belt stretch is the largest term (',
      mm(size),
      '). To halve it to ',
      mm(half),
      ", double the belt's axial stiffness EA (now ",
      qty(d.axialStiffnessN, 'forceN'),
      ': a wider or steel-corded belt) or halve the acceleration (now ',
      qty(d.accelMPerS2, 'accelMPerS2'),
      '); shorter belt arms also help.',
    ],
    loadAngle: [
      "The motors' load angle is the largest term (",
      mm(size),
      '). To halve it to about ',
      mm(half),
      ', use a motor with twice the holding torque (now ',
      qty(d.holdingTorqueNm, 'torqueNm'),
      ') or a 0.9° motor (twice the rotor teeth), or halve the acceleration (now ',
      qty(d.accelMPerS2, 'accelMPerS2'),
      ').',
    ],
    deadband: [
      'The microstep deadband is the largest term (',
      mm(size),
      '). To halve it to about ',
      mm(half),
      ', halve the guide friction (now ',
      qty(d.frictionXN, 'forceN'),
      ' in X, ',
      qty(d.frictionYN, 'forceN'),
      ' in Y) or double the holding torque (now ',
      qty(d.holdingTorqueNm, 'torqueNm'),
      '); a 0.9° motor halves it as well.',
    ],
    runout: [
      'Drive pulley runout is the largest term (',
      mm(size),
      '). To halve it to ',
      mm(half),
      ", halve the pulley's eccentricity (now ",
      mm(d.runoutMm),
      '): a better pulley, or a bore without play on the shaft.',
    ],
  };
  // The parts carry the numbers so each reader shows them in their own units; the message is the metric text.
  const parts = partsOf[term];
  return { term, parts, message: parts.map((p) => (typeof p === 'string' ? p : renderQuantity(p))).join('') };
}

type CheckParts = (string | CheckQuantity)[];
