import type { LoopModel, MotorVar } from './beltLayout';
import { zeroRow } from './zeroRow';

/** Inputs of the stiffness map, SI unless the name says otherwise. */
export interface StiffnessInput {
  /** Affine piece-length models of every loop (frame coordinates). */
  models: LoopModel[];
  /** Motor variables and their belt-line holding stiffness k_θ/r² [N/m]. */
  motorStiffnessNPerM: Record<MotorVar, number>;
  /** Belt EA [N]. */
  axialStiffnessN: number;
  /** Moving mass along X and Y [kg]. */
  xKg: number;
  yKg: number;
  /** Carriage centre at travel (0, 0) in frame coordinates, and the travel [mm]. */
  originXMm: number;
  originYMm: number;
  travelXMm: number;
  travelYMm: number;
  /** Grid points per axis (2 … 101). */
  points: number;
  /**
   * Change of each piece's length per radian of gantry yaw, per model and piece [mm/rad] (gantryYaw.ts); with it the
   * map also condenses the yaw coordinate (docs/models/structural-modes.md).
   */
  yawSlopesMmPerRad?: number[][];
  /**
   * A cross shaft: the drive pulley of loop `loopId` is not the motor itself but the far end of a shaft of
   * belt-line torsional stiffness `stiffnessNPerM` (k_s/r²) from the motor of its node.
   */
  shaft?: { loopId: string; stiffnessNPerM: number };
}

/** Stiffness map result. */
export interface StiffnessResult {
  /** Grid coordinates in travel coordinates [mm]. */
  xMm: number[];
  yMm: number[];
  /** Lowest natural frequency at each grid point, indexed [iy][ix] [Hz]. */
  lowestFrequencyHz: number[][];
  /** Weakest point of the map. */
  min: { frequencyHz: number; xMm: number; yMm: number };
  /** Carriage stiffness matrix at the weakest point [N/m]. */
  matrixAtMinNPerM: [[number, number], [number, number]];
  /** Condensed carriage stiffness at every grid point, flat [iy·nx + ix] [N/m] (reused by the error budget). */
  kNPerM: { xx: Float64Array; xy: Float64Array; yy: Float64Array };
  /**
   * With yaw slopes: the yaw rows of the condensed stiffness at a grid point, condensed on demand (the yaw mode is
   * solved at sampled points only) [N/rad, N·m/rad].
   */
  yawAt: ((ix: number, iy: number) => { xf: number; yf: number; ff: number }) | null;
}

function linspace(a: number, b: number, n: number): number[] {
  const out: number[] = []; // filled in order: a packed array (src/engine/zeroRow.ts)
  for (let i = 0; i < n; i++) out[i] = n === 1 ? a : a + ((b - a) * i) / (n - 1);
  return out;
}

/**
 * Carriage stiffness matrix at one position by static condensation. Each belt piece between two load-bearing
 * nodes (clamp or drive pulley) is a spring EA/L whose stretch is G·q + Σ T·m, with q the carriage displacement
 * and m the belt each motor pulley passes on; the motors are springs k_θ/r² to ground. Minimising the energy
 * over the (massless) motor variables gives K_c = H_qq − H_qm·H_mm⁻¹·H_mq. For one motor per loop this is the
 * loop's two arms in parallel, EA·(1/L₁ + 1/L₂), in series with the motor (docs/models/stiffness-and-ringing.md); it also covers the
 * single H loop with two motors and the cross-shaft cartesian Y drive.
 * @param inp - stiffness input (see StiffnessInput)
 * @param cxcMm - carriage centre X in frame coordinates [mm]
 * @param cycMm - carriage centre Y in frame coordinates [mm]
 * @returns 2×2 stiffness matrix [N/m]
 * @see S. S. Rao, Mechanical Vibrations, 5th ed., ch. 1 (springs in series and parallel) and ch. 5 (from memory)
 */
export function carriageStiffnessNPerM(inp: StiffnessInput, cxcMm: number, cycMm: number): [[number, number], [number, number]] {
  const prep = prepare(inp);
  condense(prep, inp.axialStiffnessN, cxcMm, cycMm);
  const o = prep.out;
  return [
    [o[0], o[1]],
    [o[1], o[2]],
  ];
}

// Up to three motor variables (A, B, B2). Fewer are padded with a decoupled unit spring, which adds nothing
// to the condensation, so one branch-free scalar routine serves every mechanism (the map calls it ~10⁴ times).
const NV = 3;

interface Prepared {
  /** Piece data as flat arrays: base length, slopes and the transfer coefficient of each motor variable. */
  l0: Float64Array;
  gx: Float64Array;
  gy: Float64Array;
  /** Yaw slope of each piece [m/rad] (zeros without yaw). */
  gf: Float64Array;
  t: Float64Array;
  pieces: number;
  /** Starting H_mm: the motor springs on the diagonal and a cross shaft's coupling [N/m]: h00 h01 h02 h11 h12 h22. */
  h0: Float64Array;
  /** Result of the last condensation: kxx, kxy, kyy [N/m]. */
  out: Float64Array;
}

function prepare(inp: StiffnessInput): Prepared {
  // A loop driven through the cross shaft gets its own pulley variable, tied to the motor by the shaft's spring.
  const varOf = (loopId: string, v: MotorVar): string => (inp.shaft && inp.shaft.loopId === loopId ? `${v}:shaft` : v);
  const vars: string[] = [];
  for (const m of inp.models) for (const v of m.nodeMotors) if (!vars.includes(varOf(m.loopId, v))) vars.push(varOf(m.loopId, v));
  const count = inp.models.reduce((s, m) => s + m.pieces.length, 0);
  const km = new Float64Array(NV).fill(1);
  vars.forEach((v, i) => (km[i] = v.endsWith(':shaft') ? 0 : inp.motorStiffnessNPerM[v as MotorVar]));
  const h0 = Float64Array.from([km[0], 0, 0, km[1], 0, km[2]]);
  if (inp.shaft) {
    const far = vars.findIndex((v) => v.endsWith(':shaft'));
    const near = far >= 0 ? vars.indexOf(vars[far].replace(':shaft', '')) : -1;
    if (far >= 0 && near >= 0) {
      const k = inp.shaft.stiffnessNPerM;
      const diag = [0, 3, 5];
      const off = (i: number, j: number) => (i + j === 1 ? 1 : i + j === 2 ? 2 : 4);
      h0[diag[near]] += k;
      h0[diag[far]] += k;
      h0[off(Math.min(near, far), Math.max(near, far))] -= k;
    }
  }
  const prep: Prepared = {
    l0: new Float64Array(count),
    gx: new Float64Array(count),
    gy: new Float64Array(count),
    gf: new Float64Array(count),
    t: new Float64Array(count * NV),
    pieces: count,
    h0,
    out: new Float64Array(3),
  };
  let r = 0;
  inp.models.forEach((m, mi) => {
    m.pieces.forEach((pc, i) => {
      // A motor between piece i−1 and i passes belt from the earlier piece to the later one.
      if (i > 0) prep.t[r * NV + vars.indexOf(varOf(m.loopId, m.nodeMotors[i - 1]))] -= 1;
      if (i < m.nodeMotors.length) prep.t[r * NV + vars.indexOf(varOf(m.loopId, m.nodeMotors[i]))] += 1;
      prep.l0[r] = pc.l0Mm;
      prep.gx[r] = pc.gx;
      prep.gy[r] = pc.gy;
      prep.gf[r] = (inp.yawSlopesMmPerRad?.[mi]?.[i] ?? 0) / 1000;
      r++;
    });
  });
  return prep;
}

function condense(prep: Prepared, eaN: number, cxcMm: number, cycMm: number): void {
  const { t, l0, gx: gxs, gy: gys } = prep;
  let h00 = prep.h0[0];
  let h01 = prep.h0[1];
  let h02 = prep.h0[2];
  let h11 = prep.h0[3];
  let h12 = prep.h0[4];
  let h22 = prep.h0[5];
  let x0 = 0;
  let x1 = 0;
  let x2 = 0;
  let y0 = 0;
  let y1 = 0;
  let y2 = 0;
  let kxx = 0;
  let kxy = 0;
  let kyy = 0;
  const ea = eaN * 1000;
  for (let r = 0; r < prep.pieces; r++) {
    const gx = gxs[r];
    const gy = gys[r];
    const len = l0[r] + gx * cxcMm + gy * cycMm;
    const k = ea / (len > 1e-3 ? len : 1e-3);
    const kgx = k * gx;
    const kgy = k * gy;
    kxx += kgx * gx;
    kxy += kgx * gy;
    kyy += kgy * gy;
    const o = r * NV;
    const t0 = t[o];
    const t1 = t[o + 1];
    const t2 = t[o + 2];
    x0 += kgx * t0;
    x1 += kgx * t1;
    x2 += kgx * t2;
    y0 += kgy * t0;
    y1 += kgy * t1;
    y2 += kgy * t2;
    h00 += k * t0 * t0;
    h11 += k * t1 * t1;
    h22 += k * t2 * t2;
    h01 += k * t0 * t1;
    h02 += k * t0 * t2;
    h12 += k * t1 * t2;
  }
  // H_qm·H_mm⁻¹·H_mq by symmetric Gaussian elimination (LDLᵀ): Σ (L⁻¹·h)ᵢ²/dᵢ.
  const f10 = h01 / h00;
  const f20 = h02 / h00;
  const d1 = h11 - f10 * h01;
  const e12 = h12 - f10 * h02;
  const d2raw = h22 - f20 * h02;
  const f21 = e12 / d1;
  const d2 = d2raw - f21 * e12;
  const x1b = x1 - f10 * x0;
  const y1b = y1 - f10 * y0;
  const x2b = x2 - f20 * x0 - f21 * x1b;
  const y2b = y2 - f20 * y0 - f21 * y1b;
  prep.out[0] = kxx - (x0 * x0) / h00 - (x1b * x1b) / d1 - (x2b * x2b) / d2;
  prep.out[1] = kxy - (x0 * y0) / h00 - (x1b * y1b) / d1 - (x2b * y2b) / d2;
  prep.out[2] = kyy - (y0 * y0) / h00 - (y1b * y1b) / d1 - (y2b * y2b) / d2;
}

/** Entries of the 6-vector (gx, gy, gφ, t0, t1, t2) a piece's stretch is made of. */
const NQ = 6;
/** Products of two entries (upper triangle of the 6 × 6 outer product). */
const NP = (NQ * (NQ + 1)) / 2;

/**
 * Static condensation at one grid point: sums the piece groups' outer products (upper triangle of the 6 × 6 of
 * (gx, gy, gφ, t0, t1, t2), 21 products), then removes the three motor variables from the 3 × 3 carriage block
 * (x, y, φ) by symmetric elimination (LDLᵀ): K_c = H_qq − H_qm·H_mm⁻¹·H_mq. Written out in scalars because the
 * map runs it at every grid point.
 * @param kg - spring of each group at this point [N/m]
 * @param coef - the groups' 21 products each
 * @param ng - number of groups
 * @param h0 - starting H_mm (motor springs, cross-shaft coupling): h00 h01 h02 h11 h12 h22
 * @param out - written: kxx, kxy, kyy, kxφ, kyφ, kφφ
 */
function condensePoint(kg: Float64Array, coef: Float64Array, ng: number, h0: Float64Array, out: Float64Array): void {
  let xx = 0,
    xy = 0,
    xf = 0,
    x0 = 0,
    x1 = 0,
    x2 = 0,
    yy = 0,
    yf = 0,
    y0 = 0,
    y1 = 0,
    y2 = 0,
    ff = 0,
    f0 = 0,
    f1 = 0,
    f2 = 0;
  let h00 = h0[0],
    h01 = h0[1],
    h02 = h0[2],
    h11 = h0[3],
    h12 = h0[4],
    h22 = h0[5];
  for (let g = 0; g < ng; g++) {
    const k = kg[g];
    const o = g * NP;
    xx += k * coef[o];
    xy += k * coef[o + 1];
    xf += k * coef[o + 2];
    x0 += k * coef[o + 3];
    x1 += k * coef[o + 4];
    x2 += k * coef[o + 5];
    yy += k * coef[o + 6];
    yf += k * coef[o + 7];
    y0 += k * coef[o + 8];
    y1 += k * coef[o + 9];
    y2 += k * coef[o + 10];
    ff += k * coef[o + 11];
    f0 += k * coef[o + 12];
    f1 += k * coef[o + 13];
    f2 += k * coef[o + 14];
    h00 += k * coef[o + 15];
    h01 += k * coef[o + 16];
    h02 += k * coef[o + 17];
    h11 += k * coef[o + 18];
    h12 += k * coef[o + 19];
    h22 += k * coef[o + 20];
  }
  const f10 = h01 / h00;
  const f20 = h02 / h00;
  const d1 = h11 - f10 * h01;
  const e12 = h12 - f10 * h02;
  const f21 = e12 / d1;
  const d2 = h22 - f20 * h02 - f21 * e12;
  const x1b = x1 - f10 * x0;
  const y1b = y1 - f10 * y0;
  const f1b = f1 - f10 * f0;
  const x2b = x2 - f20 * x0 - f21 * x1b;
  const y2b = y2 - f20 * y0 - f21 * y1b;
  const f2b = f2 - f20 * f0 - f21 * f1b;
  out[0] = xx - (x0 * x0) / h00 - (x1b * x1b) / d1 - (x2b * x2b) / d2;
  out[1] = xy - (x0 * y0) / h00 - (x1b * y1b) / d1 - (x2b * y2b) / d2;
  out[2] = yy - (y0 * y0) / h00 - (y1b * y1b) / d1 - (y2b * y2b) / d2;
  out[3] = xf - (x0 * f0) / h00 - (x1b * f1b) / d1 - (x2b * f2b) / d2;
  out[4] = yf - (y0 * f0) / h00 - (y1b * f1b) / d1 - (y2b * f2b) / d2;
  out[5] = ff - (f0 * f0) / h00 - (f1b * f1b) / d1 - (f2b * f2b) / d2;
}

/**
 * Stiffness map: the lowest natural frequency of the carriage (2×2 problem K·v = ω²·M·v, M = diag(m_x, m_y), the
 * gantry held square) at every point of a grid over the travel, its minimum and where it occurs; also the
 * condensed stiffness at every point (for the error budget) and, with yaw slopes, its yaw rows (for the gantry yaw
 * mode). See docs/models/structural-modes.md and the stiffness-map page.
 * @param inp - stiffness input (see StiffnessInput)
 * @returns grid [mm], frequencies [Hz] indexed [iy][ix], minimum, per-point stiffness [N/m, N/rad, N·m/rad]
 * @see S. S. Rao, Mechanical Vibrations, 5th ed., ch. 5, two-degree-of-freedom systems (from memory)
 */
export function stiffnessMap(inp: StiffnessInput): StiffnessResult {
  const prep = prepare(inp);
  const xs = linspace(0, inp.travelXMm, inp.points);
  const ys = linspace(0, inp.travelYMm, inp.points);
  const nx = xs.length;
  const ny = ys.length;
  const n = prep.pieces;
  const ea = inp.axialStiffnessN * 1000;
  // Two groupings of the pieces: without the yaw slope for the belt mode at every point (15 products), and with it
  // for the yaw rows, condensed only where the yaw mode is asked for (21 products).
  const plain = groupPieces(prep, false);
  const withYaw = groupPieces(prep, true);
  const { colK, rowK, mixed } = pieceSprings(prep, ea, inp, xs, ys);
  const plainK = groupSprings(plain, colK, rowK, n, nx, ny);
  const mixedPieces = Int32Array.from(mixed);
  const grid = beltModeGrid(prep, plain, plainK, mixedPieces, inp, xs, ys);
  const hasYaw = prep.gf.some((g) => g !== 0);
  const kgYaw = new Float64Array(withYaw.count);
  const yawK = hasYaw ? groupSprings(withYaw, colK, rowK, n, nx, ny) : plainK;
  const outYaw = new Float64Array(6);
  const ngYaw = withYaw.count;
  const groupOfYaw = withYaw.groupOf;
  const { l0, gx, gy } = prep;
  return {
    xMm: xs,
    yMm: ys,
    lowestFrequencyHz: grid.f,
    min: grid.best,
    matrixAtMinNPerM: grid.bestK,
    kNPerM: grid.k,
    yawAt: hasYaw
      ? (ix, iy) => {
          // Each group's springs at this point (column, row and mixed parts, in the map's order), then the condensation.
          for (let g = 0; g < ngYaw; g++) kgYaw[g] = yawK.col[g * nx + ix] + yawK.row[g * ny + iy];
          const cx = inp.originXMm + xs[ix];
          const cy = inp.originYMm + ys[iy];
          for (let m = 0; m < mixedPieces.length; m++) {
            const r = mixedPieces[m];
            const len = l0[r] + gx[r] * cx + gy[r] * cy;
            kgYaw[groupOfYaw[r]] += ea / (len > 1e-3 ? len : 1e-3);
          }
          condensePoint(kgYaw, withYaw.coef, ngYaw, prep.h0, outYaw);
          return { xf: outYaw[3], yf: outYaw[4], ff: outYaw[5] };
        }
      : null,
  };
}

/** What the belt-mode grid reads at every point, and the weakest point so far (see {@link beltModeGrid}). */
interface BeltGrid {
  prep: Prepared;
  groupOf: Int32Array;
  coef: Float64Array;
  ng: number;
  colG: Float64Array;
  rowG: Float64Array;
  mixedPieces: Int32Array;
  xs: number[];
  ys: number[];
  ox: number;
  oy: number;
  ea: number;
  xKg: number;
  yKg: number;
  sqrtMass: number;
  kg: Float64Array;
  kxx: Float64Array;
  kxy: Float64Array;
  kyy: Float64Array;
  blank: number[];
  bestHz: number;
  bestP: number;
}

/**
 * The belt mode at every grid point: each group's spring (tabled column and row parts, plus the pieces that change
 * with both), the condensation of the 15 products written out and the lowest eigenvalue of the 2 × 2 problem with
 * √(m_x·m_y) taken once; the weakest point is the first within 1e-9 Hz of the lowest. One call per row (an
 * ordinary hot function for the optimiser rather than one long loop).
 */
function beltModeGrid(
  prep: Prepared,
  plain: { groupOf: Int32Array; count: number; coef: Float64Array },
  plainK: GroupSprings,
  mixedPieces: Int32Array,
  inp: StiffnessInput,
  xs: number[],
  ys: number[],
): { f: number[][]; best: StiffnessResult['min']; bestK: StiffnessResult['matrixAtMinNPerM']; k: StiffnessResult['kNPerM'] } {
  const n = xs.length * ys.length;
  const st: BeltGrid = {
    prep,
    groupOf: plain.groupOf,
    coef: plain.coef,
    ng: plain.count,
    colG: plainK.col,
    rowG: plainK.row,
    mixedPieces,
    xs,
    ys,
    ox: inp.originXMm,
    oy: inp.originYMm,
    ea: inp.axialStiffnessN * 1000,
    xKg: inp.xKg,
    yKg: inp.yKg,
    sqrtMass: Math.sqrt(inp.xKg * inp.yKg),
    kg: new Float64Array(plain.count),
    kxx: new Float64Array(n),
    kxy: new Float64Array(n),
    kyy: new Float64Array(n),
    blank: zeroRow(xs.length),
    bestHz: Infinity,
    bestP: -1,
  };
  const f: number[][] = [];
  for (let iy = 0; iy < ys.length; iy++) f.push(beltModeRow(st, iy));
  const k = { xx: st.kxx, xy: st.kxy, yy: st.kyy };
  return { f, ...weakestOf(st.bestP, st.bestHz, xs, ys, k), k };
}

/** One row of {@link beltModeGrid}: frequencies [Hz], and the condensed stiffness stored per point. */
function beltModeRow(st: BeltGrid, iy: number): number[] {
  const { groupOf, coef, ng, colG, rowG, mixedPieces, xs, ys, ox, ea, xKg, yKg, sqrtMass, kg } = st;
  const { l0, gx, gy, h0 } = st.prep;
  const { kxx: kxxA, kxy: kxyA, kyy: kyyA } = st;
  const nx = xs.length;
  const ny = ys.length;
  const nm = mixedPieces.length;
  const twoPi = 2 * Math.PI;
  let bestHz = st.bestHz;
  let bestP = st.bestP;
  const row = st.blank.slice();
  const cy = st.oy + ys[iy];
  for (let ix = 0; ix < nx; ix++) {
    for (let g = 0; g < ng; g++) kg[g] = colG[g * nx + ix] + rowG[g * ny + iy];
    if (nm > 0) {
      const cx = ox + xs[ix];
      for (let mi = 0; mi < nm; mi++) {
        const r = mixedPieces[mi];
        const len = l0[r] + gx[r] * cx + gy[r] * cy;
        kg[groupOf[r]] += ea / (len > 1e-3 ? len : 1e-3);
      }
    }
    let kxx = 0,
      kxy = 0,
      x0 = 0,
      x1 = 0,
      x2 = 0,
      kyy = 0,
      y0 = 0,
      y1 = 0,
      y2 = 0;
    let h00 = h0[0],
      h01 = h0[1],
      h02 = h0[2],
      h11 = h0[3],
      h12 = h0[4],
      h22 = h0[5];
    for (let g = 0; g < ng; g++) {
      const k = kg[g];
      const o = g * 15;
      kxx += k * coef[o];
      kxy += k * coef[o + 1];
      x0 += k * coef[o + 2];
      x1 += k * coef[o + 3];
      x2 += k * coef[o + 4];
      kyy += k * coef[o + 5];
      y0 += k * coef[o + 6];
      y1 += k * coef[o + 7];
      y2 += k * coef[o + 8];
      h00 += k * coef[o + 9];
      h01 += k * coef[o + 10];
      h02 += k * coef[o + 11];
      h11 += k * coef[o + 12];
      h12 += k * coef[o + 13];
      h22 += k * coef[o + 14];
    }
    const f10 = h01 / h00;
    const f20 = h02 / h00;
    const d1 = h11 - f10 * h01;
    const e12 = h12 - f10 * h02;
    const f21 = e12 / d1;
    const d2 = h22 - f20 * h02 - f21 * e12;
    const x1b = x1 - f10 * x0;
    const y1b = y1 - f10 * y0;
    const x2b = x2 - f20 * x0 - f21 * x1b;
    const y2b = y2 - f20 * y0 - f21 * y1b;
    const cxx = kxx - (x0 * x0) / h00 - (x1b * x1b) / d1 - (x2b * x2b) / d2;
    const cxy = kxy - (x0 * y0) / h00 - (x1b * y1b) / d1 - (x2b * y2b) / d2;
    const cyy = kyy - (y0 * y0) / h00 - (y1b * y1b) / d1 - (y2b * y2b) / d2;
    const p = iy * nx + ix;
    kxxA[p] = cxx;
    kxyA[p] = cxy;
    kyyA[p] = cyy;
    const ea2 = cxx / xKg;
    const ed2 = cyy / yKg;
    const eb2 = cxy / sqrtMass;
    const lam = (ea2 + ed2) / 2 - Math.sqrt(((ea2 - ed2) / 2) * ((ea2 - ed2) / 2) + eb2 * eb2);
    const hz = Math.sqrt(lam > 0 ? lam : 0) / twoPi;
    row[ix] = hz;
    if (hz < bestHz - 1e-9) {
      bestHz = hz;
      bestP = p;
    }
  }
  st.bestHz = bestHz;
  st.bestP = bestP;
  return row;
}

/** The weakest point of the belt-mode map (flat index `p`, −1 when no point had a frequency) and K there. */
function weakestOf(
  p: number,
  hz: number,
  xs: number[],
  ys: number[],
  k: StiffnessResult['kNPerM'],
): { best: StiffnessResult['min']; bestK: StiffnessResult['matrixAtMinNPerM'] } {
  if (p < 0) {
    return {
      best: { frequencyHz: Infinity, xMm: 0, yMm: 0 },
      bestK: [
        [0, 0],
        [0, 0],
      ],
    };
  }
  return {
    best: { frequencyHz: hz, xMm: xs[p % xs.length], yMm: ys[Math.floor(p / xs.length)] },
    bestK: [
      [k.xx[p], k.xy[p]],
      [k.xy[p], k.yy[p]],
    ],
  };
}

/**
 * Springs EA/L of the pieces whose length depends on one coordinate only, per column [r·nx + ix] or per row
 * [r·ny + iy] (0 in the other table), computed once instead of per point; pieces that change with both are listed.
 */
function pieceSprings(
  prep: Prepared,
  ea: number,
  inp: StiffnessInput,
  xs: number[],
  ys: number[],
): { colK: Float64Array; rowK: Float64Array; mixed: number[] } {
  const n = prep.pieces;
  const nx = xs.length;
  const ny = ys.length;
  const colK = new Float64Array(n * nx);
  const rowK = new Float64Array(n * ny);
  const mixed: number[] = [];
  for (let r = 0; r < n; r++) {
    const gx = prep.gx[r];
    const gy = prep.gy[r];
    if (gx !== 0 && gy !== 0) {
      mixed.push(r);
      continue;
    }
    for (let ix = 0; ix < nx; ix++) {
      colK[r * nx + ix] = gy === 0 ? ea / Math.max(1e-3, prep.l0[r] + gx * (inp.originXMm + xs[ix])) : 0;
    }
    for (let iy = 0; iy < ny; iy++) {
      rowK[r * ny + iy] = gx === 0 ? ea / Math.max(1e-3, prep.l0[r] + gy * (inp.originYMm + ys[iy])) : 0;
    }
  }
  // A piece with gx = gy = 0 (constant length) got ea/l0 in both tables; keep only the column value.
  for (let r = 0; r < n; r++) if (prep.gx[r] === 0 && prep.gy[r] === 0) for (let iy = 0; iy < ny; iy++) rowK[r * ny + iy] = 0;
  return { colK, rowK, mixed };
}

/** Springs of each group of pieces tabled over the grid: the part that changes with X, [g·nx + ix], and with Y, [g·ny + iy]. */
interface GroupSprings {
  col: Float64Array;
  row: Float64Array;
}

/**
 * The pieces of a group share their vector, so they all change with X only, with Y only, or with both: a group's
 * spring is tabled per column and per row once, summed in piece order (a piece's spring is in one table only, 0 in
 * the other; pieces that change with both are summed at each point).
 * @param grouping - group of each piece and the group count
 * @param colK - spring of each piece per column [r·nx + ix] (0 for pieces that do not change with X only) [N/m]
 * @param rowK - spring of each piece per row [r·ny + iy] [N/m]
 */
function groupSprings(
  grouping: { groupOf: Int32Array; count: number },
  colK: Float64Array,
  rowK: Float64Array,
  n: number,
  nx: number,
  ny: number,
): GroupSprings {
  const col = new Float64Array(grouping.count * nx);
  const row = new Float64Array(grouping.count * ny);
  for (let r = 0; r < n; r++) {
    const g = grouping.groupOf[r];
    for (let ix = 0; ix < nx; ix++) col[g * nx + ix] += colK[r * nx + ix];
    for (let iy = 0; iy < ny; iy++) row[g * ny + iy] += rowK[r * ny + iy];
  }
  return { col, row };
}

/**
 * Groups pieces whose vectors (gx, gy, [gφ,] t) are parallel: they share one outer product, so their springs are
 * summed first (corexy's two arms of a loop, for instance, are one group).
 * @param prep - prepared pieces
 * @param withYaw - include the yaw slope gφ in the vectors
 * @returns group of each piece, the number of groups and each group's products (15 without yaw, 21 with)
 */
function groupPieces(prep: Prepared, withYaw: boolean): { groupOf: Int32Array; count: number; coef: Float64Array } {
  const n = prep.pieces;
  const groupOf = new Int32Array(n);
  const groups: number[][] = [];
  const vec = (r: number) =>
    withYaw
      ? [prep.gx[r], prep.gy[r], prep.gf[r], prep.t[r * NV], prep.t[r * NV + 1], prep.t[r * NV + 2]]
      : [prep.gx[r], prep.gy[r], prep.t[r * NV], prep.t[r * NV + 1], prep.t[r * NV + 2]];
  for (let r = 0; r < n; r++) {
    const v = vec(r);
    let found = -1;
    for (let g = 0; g < groups.length && found < 0; g++) {
      const w = groups[g];
      if (v.every((x, i) => x === w[i]) || v.every((x, i) => x === -w[i])) found = g;
    }
    if (found < 0) {
      found = groups.length;
      groups.push(v);
    }
    groupOf[r] = found;
  }
  const len = withYaw ? NQ : NQ - 1;
  const np = (len * (len + 1)) / 2;
  const coef = new Float64Array(groups.length * np);
  groups.forEach((v, g) => {
    let c = 0;
    for (let i = 0; i < len; i++) for (let j = i; j < len; j++) coef[g * np + c++] = v[i] * v[j];
  });
  return { groupOf, count: groups.length, coef };
}
