import type { BeltLayout, LoopModel } from './beltLayout';
import type { Matrix2 } from './linalg';
import type { TensionPlace } from './types';
import { zeroRow } from './zeroRow';

// Model and derivation: docs/models/belt-tension.md §3–4.

/** Belt pulls of the two motor coordinates at the points of the envelope (SI, signed as K's rows). */
export interface PullPairs {
  /** Pull of coordinate A and B at each point [N]. */
  aN: Float64Array;
  bN: Float64Array;
  /** Direction of travel of each point [°]. */
  directionDeg: Float64Array;
}

/** Tension of one belt over the travel and every envelope direction. */
export interface LoopTensionResult {
  loopId: string;
  /** Largest pull any of the loop's drive pulleys transmits [N]. */
  peakPullN: number;
  worstTightN: number;
  worstTightAt: TensionPlace;
  worstSlackN: number;
  worstSlackAt: TensionPlace;
  /** Highest tension of any piece at each grid point, over every direction [N], indexed [iy][ix]. */
  tightMapN: number[][];
  /** Lowest tension of any piece at each grid point, over every direction [N], indexed [iy][ix]. */
  slackMapN: number[][];
}

/** What the tension map needs. */
export interface BeltTensionInput {
  models: LoopModel[];
  motorVars: BeltLayout['motorVars'];
  /** Motor-to-carriage matrix K (motor directions applied). */
  k: Matrix2;
  pretensionN: number;
  pairs: PullPairs;
  /** Carriage centre at travel (0, 0) in frame coordinates [mm]. */
  originXMm: number;
  originYMm: number;
  /** Grid in travel coordinates [mm] (the stiffness-map grid). */
  xMm: readonly number[];
  yMm: readonly number[];
}

/**
 * Indices of the convex hull of a planar point set (Andrew's monotone chain), counter-clockwise. A linear
 * function's extremes over the set are its extremes over these points.
 * @param xs - first coordinates
 * @param ys - second coordinates
 * @returns indices of the hull's vertices
 * @see A. M. Andrew, "Another efficient algorithm for convex hulls in two dimensions", Inf. Proc. Letters 9 (1979) (from memory)
 */
export function convexHullIndices(xs: ArrayLike<number>, ys: ArrayLike<number>): number[] {
  const idx = interiorCulled(xs, ys).sort((i, j) => xs[i] - xs[j] || ys[i] - ys[j]);
  if (idx.length < 3) return idx;
  const cross = (o: number, a: number, b: number) => (xs[a] - xs[o]) * (ys[b] - ys[o]) - (ys[a] - ys[o]) * (xs[b] - xs[o]);
  const lower: number[] = [];
  for (const i of idx) {
    while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], i) <= 0) lower.pop();
    lower.push(i);
  }
  const upper: number[] = [];
  for (let n = idx.length - 1; n >= 0; n--) {
    const i = idx[n];
    while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], i) <= 0) upper.pop();
    upper.push(i);
  }
  lower.pop();
  upper.pop();
  return lower.concat(upper);
}

/**
 * Indices of the points that may lie on the hull, in their original order: points well inside the quadrilateral
 * of the leftmost, lowest, rightmost and highest points are left out (they can be neither vertices nor decide
 * which of two equal points stays), so the sort and the chain see a few dozen points instead of every pull pair.
 * Points within a round-off band of an edge are kept.
 * @see S. G. Akl and G. T. Toussaint, "A fast convex hull algorithm", Inf. Proc. Letters 7 (1978) (from memory)
 */
function interiorCulled(xs: ArrayLike<number>, ys: ArrayLike<number>): number[] {
  const n = xs.length;
  if (n < 8) return Array.from({ length: n }, (_, i) => i);
  let l = 0;
  let r = 0;
  let b = 0;
  let t = 0;
  let scale = 0;
  for (let i = 1; i < n; i++) {
    if (xs[i] < xs[l]) l = i;
    if (xs[i] > xs[r]) r = i;
    if (ys[i] < ys[b]) b = i;
    if (ys[i] > ys[t]) t = i;
  }
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(xs[i]), Math.abs(ys[i]));
  // Twice a triangle's area is ≤ 4·scale²; a margin far above round-off of such products and far below any real area.
  const eps = 1e-9 * scale * scale;
  const quad = [l, b, r, t];
  const keep: number[] = [];
  for (let i = 0; i < n; i++) {
    let inside = true;
    for (let e = 0; e < 4 && inside; e++) {
      const o = quad[e];
      const a = quad[(e + 1) % 4];
      inside = (xs[a] - xs[o]) * (ys[i] - ys[o]) - (ys[a] - ys[o]) * (xs[i] - xs[o]) > eps;
    }
    if (!inside) keep.push(i);
  }
  return keep;
}

/** One loop prepared for the grid: affine piece lengths and, per piece, S coefficients per coordinate. */
interface PreparedLoop {
  l0: Float64Array;
  gx: Float64Array;
  gy: Float64Array;
  /** S_{i,c}: Σ over the drive pulleys before piece i of σ_k/n_c for coordinate c (0 = A, 1 = B). */
  sA: Float64Array;
  sB: Float64Array;
  /** Coordinates that pull this loop. */
  usesA: boolean;
  usesB: boolean;
  /** Largest |σ/n| per coordinate: share of a coordinate's pull one drive pulley of this loop transmits. */
  shareA: number;
  shareB: number;
}

function prepareLoop(model: LoopModel, inp: BeltTensionInput, nodesPerCoord: [number, number]): PreparedLoop {
  const n = model.pieces.length;
  const p: PreparedLoop = {
    l0: new Float64Array(n),
    gx: new Float64Array(n),
    gy: new Float64Array(n),
    sA: new Float64Array(n),
    sB: new Float64Array(n),
    usesA: false,
    usesB: false,
    shareA: 0,
    shareB: 0,
  };
  let cx = 0;
  let cy = 0;
  model.pieces.forEach((pc, i) => {
    p.l0[i] = pc.l0Mm;
    p.gx[i] = pc.gx;
    p.gy[i] = pc.gy;
    if (i === 0) return;
    // The drive pulley between piece i−1 and piece i.
    const prev = model.pieces[i - 1];
    // Belt it passes on per unit carriage move: −Σ_{j<i} ∂Lⱼ/∂q (an inextensible belt, clamped at its start).
    cx -= prev.gx;
    cy -= prev.gy;
    const coord = inp.motorVars.find((v) => v.id === model.nodeMotors[i - 1])?.coordinate ?? 0;
    const row = inp.k[coord];
    // That flow is ±(K row) of its coordinate; σ says which way, so that F_pulley = σ·F_coordinate / n_coordinate.
    const share = (cx * row[0] + cy * row[1] >= 0 ? 1 : -1) / nodesPerCoord[coord];
    p.sA[i] = p.sA[i - 1] + (coord === 0 ? share : 0);
    p.sB[i] = p.sB[i - 1] + (coord === 1 ? share : 0);
    if (coord === 0) {
      p.usesA = true;
      p.shareA = Math.max(p.shareA, Math.abs(share));
    } else {
      p.usesB = true;
      p.shareB = Math.max(p.shareB, Math.abs(share));
    }
  });
  return p;
}

/**
 * Worst tight and slack side of every belt over the travel grid and every envelope direction, at rest and at
 * cruise. At each grid point the piece tensions are linear in the coordinates' pulls (F_A, F_B), so their extremes
 * over all directions are their extremes over the convex hull of the envelope's pull pairs (computed once).
 * @param inp - loop models, motor variables, K, pretension, pull pairs and the grid
 * @returns one result per loop
 * @see docs/models/belt-tension.md §4
 */
export function beltTensionOverTravel(inp: BeltTensionInput): LoopTensionResult[] {
  const nodesPerCoord: [number, number] = [0, 0];
  for (const m of inp.models) for (const v of m.nodeMotors) nodesPerCoord[inp.motorVars.find((mv) => mv.id === v)?.coordinate ?? 0] += 1;
  nodesPerCoord[0] = Math.max(1, nodesPerCoord[0]);
  nodesPerCoord[1] = Math.max(1, nodesPerCoord[1]);
  const { aN, bN, directionDeg } = inp.pairs;
  const prepared = inp.models.map((model) => prepareLoop(model, inp, nodesPerCoord));
  // Only a loop pulled by both coordinates needs the hull (the H loop); the others take one coordinate's extremes.
  const hull = prepared.some((p) => p.usesA && p.usesB) ? convexHullIndices(aN, bN) : [];
  let maxAbsA = 0;
  let maxAbsB = 0;
  for (let i = 0; i < aN.length; i++) {
    maxAbsA = Math.max(maxAbsA, Math.abs(aN[i]));
    maxAbsB = Math.max(maxAbsB, Math.abs(bN[i]));
  }
  return inp.models.map((model, i) => loopOverTravel(model, prepared[i], inp, hull, [maxAbsA, maxAbsB], directionDeg));
}

/** Index of the extreme vertex (sign 1: largest, −1: smallest) of ca·x + cb·y, walking from `j` round the polygon. */
function climb(va: Float64Array, vb: Float64Array, ca: number, cb: number, j: number, sign: number): number {
  const nv = va.length;
  let best = sign * (ca * va[j] + cb * vb[j]);
  for (;;) {
    const next = j + 1 === nv ? 0 : j + 1;
    const prev = j === 0 ? nv - 1 : j - 1;
    const fn = sign * (ca * va[next] + cb * vb[next]);
    const fp = sign * (ca * va[prev] + cb * vb[prev]);
    if (fn > best && fn >= fp) {
      j = next;
      best = fn;
    } else if (fp > best) {
      j = prev;
      best = fp;
    } else return j;
  }
}

/** The pull pairs a loop must be checked against: the hull's vertices, or one coordinate's two extremes. */
function loopVertices(p: PreparedLoop, pairs: PullPairs, hull: number[]): number[] {
  if (p.usesA && p.usesB) return hull;
  const vals = p.usesB ? pairs.bN : pairs.aN;
  let lo = 0;
  let hi = 0;
  for (let i = 1; i < vals.length; i++) {
    if (vals[i] < vals[lo]) lo = i;
    if (vals[i] > vals[hi]) hi = i;
  }
  return [lo, hi];
}

/**
 * The pieces' coefficients (S_A, S_B) without repeats, in the order they first occur. Pieces with the same pair have
 * the same tension change everywhere, so the extremes (and the first piece that reaches them) are found among these.
 */
function distinctShares(p: PreparedLoop): { sA: Float64Array; sB: Float64Array } {
  const keep: number[] = [];
  for (let i = 0; i < p.sA.length; i++) if (!keep.some((j) => p.sA[j] === p.sA[i] && p.sB[j] === p.sB[i])) keep.push(i);
  return { sA: Float64Array.from(keep, (i) => p.sA[i]), sB: Float64Array.from(keep, (i) => p.sB[i]) };
}

/**
 * Where a loop's share of the pull sits at a carriage position: u = Σ Lᵢ·Sᵢ / Σ Lᵢ per coordinate. Piece lengths
 * are affine in the position, so u is a ratio of two affine functions; their coefficients are summed once.
 */
interface ShareRatio {
  l0: number;
  lx: number;
  ly: number;
  /** Numerators per coordinate: constant, X and Y coefficients. */
  a0: number;
  ax: number;
  ay: number;
  b0: number;
  bx: number;
  by: number;
}

function shareRatio(p: PreparedLoop): ShareRatio {
  const r: ShareRatio = { l0: 0, lx: 0, ly: 0, a0: 0, ax: 0, ay: 0, b0: 0, bx: 0, by: 0 };
  for (let i = 0; i < p.l0.length; i++) {
    r.l0 += p.l0[i];
    r.lx += p.gx[i];
    r.ly += p.gy[i];
    r.a0 += p.l0[i] * p.sA[i];
    r.ax += p.gx[i] * p.sA[i];
    r.ay += p.gy[i] * p.sA[i];
    r.b0 += p.l0[i] * p.sB[i];
    r.bx += p.gx[i] * p.sB[i];
    r.by += p.gy[i] * p.sB[i];
  }
  return r;
}

/** Highest and lowest tension change of any piece at one grid point, and the vertex (index into the loop's vertices) of each. */
interface PointExtremes {
  hi: number;
  lo: number;
  hiV: number;
  loV: number;
}

/**
 * Extremes at one point of a loop pulled by both coordinates: a piece's change is ca·F_A + cb·F_B, linear over the
 * hull of the pull pairs. Along a convex polygon's boundary it rises to one maximum and falls to one minimum, so a
 * walk from the previous grid point's extreme vertex (`start`, the coefficients change little) finds the new one.
 */
function hullExtremes(
  p: { sA: Float64Array; sB: Float64Array },
  uA: number,
  uB: number,
  va: Float64Array,
  vb: Float64Array,
  start: Int32Array,
  e: PointExtremes,
): void {
  const nv = va.length;
  let hi = -Infinity;
  let lo = Infinity;
  let hiV = 0;
  let loV = 0;
  for (let i = 0; i < p.sA.length; i++) {
    const ca = uA - p.sA[i];
    const cb = uB - p.sB[i];
    let jh: number;
    let jl: number;
    if (nv > 2) {
      jh = climb(va, vb, ca, cb, start[2 * i], 1);
      jl = climb(va, vb, ca, cb, start[2 * i + 1], -1);
    } else {
      // A degenerate hull (every pull pair on one line): compare its ends.
      const up = nv === 2 && ca * va[1] + cb * vb[1] > ca * va[0] + cb * vb[0];
      jh = up ? 1 : 0;
      jl = nv === 2 && !up ? 1 : 0;
    }
    start[2 * i] = jh;
    start[2 * i + 1] = jl;
    const th = ca * va[jh] + cb * vb[jh];
    const tl = ca * va[jl] + cb * vb[jl];
    if (th > hi) {
      hi = th;
      hiV = jh;
    }
    if (tl < lo) {
      lo = tl;
      loV = jl;
    }
  }
  e.hi = hi;
  e.lo = lo;
  e.hiV = hiV;
  e.loV = loV;
}

/** What one loop's tension grid reads at every point, and its worst sides so far (see {@link loopOverTravel}). */
interface TensionGrid {
  single: boolean;
  /** Single loops: the pulling coordinate's distinct coefficients, its smaller and larger pull, u's numerator. */
  sv: Float64Array;
  f0: number;
  f1: number;
  n0: number;
  nxc: number;
  nyc: number;
  /** Loops pulled by both coordinates: coefficients, hull vertices and each walk's start. */
  shares: { sA: Float64Array; sB: Float64Array };
  va: Float64Array;
  vb: Float64Array;
  start: Int32Array;
  e: PointExtremes;
  r: ShareRatio;
  t0: number;
  inp: BeltTensionInput;
  verts: number[];
  blank: number[];
  worstTight: number;
  worstSlack: number;
  tightAt: number;
  slackAt: number;
  tightV: number;
  slackV: number;
  tightMap: number[][];
  slackMap: number[][];
}

function loopOverTravel(
  model: LoopModel,
  p: PreparedLoop,
  inp: BeltTensionInput,
  hull: number[],
  maxAbs: [number, number],
  directionDeg: Float64Array,
): LoopTensionResult {
  const verts = loopVertices(p, inp.pairs, hull);
  const va = Float64Array.from(verts, (v) => inp.pairs.aN[v]);
  const vb = Float64Array.from(verts, (v) => inp.pairs.bN[v]);
  // In a loop pulled by one coordinate only that coordinate's pull matters (the other's coefficients are 0).
  const fv = p.usesB ? vb : va;
  const shares = distinctShares(p);
  const r = shareRatio(p);
  const nx = inp.xMm.length;
  const st: TensionGrid = {
    single: !(p.usesA && p.usesB),
    sv: p.usesB ? shares.sB : shares.sA,
    // The smaller and the larger pull of that coordinate (a single loop's two vertices).
    f0: fv[0],
    f1: fv[1],
    n0: p.usesB ? r.b0 : r.a0,
    nxc: p.usesB ? r.bx : r.ax,
    nyc: p.usesB ? r.by : r.ay,
    shares,
    va,
    vb,
    start: new Int32Array(2 * shares.sA.length),
    e: { hi: 0, lo: 0, hiV: 0, loV: 0 },
    r,
    t0: inp.pretensionN,
    inp,
    verts,
    blank: zeroRow(nx),
    worstTight: -Infinity,
    worstSlack: Infinity,
    tightAt: -1,
    slackAt: -1,
    tightV: 0,
    slackV: 0,
    tightMap: [],
    slackMap: [],
  };
  // One call per row: the row routine is optimised as an ordinary hot function rather than mid-loop.
  for (let iy = 0; iy < inp.yMm.length; iy++) tensionRow(st, iy);
  const { tightAt, slackAt } = st;
  const place = (at: number, v: number): TensionPlace => ({
    xMm: inp.xMm[at < 0 ? 0 : at % nx],
    yMm: inp.yMm[at < 0 ? 0 : Math.floor(at / nx)],
    directionDeg: directionDeg[v],
  });
  return {
    loopId: model.loopId,
    peakPullN: Math.max(p.shareA * maxAbs[0], p.shareB * maxAbs[1]),
    worstTightN: st.worstTight,
    worstTightAt: place(tightAt, tightAt < 0 ? verts[0] : st.tightV),
    worstSlackN: st.worstSlack,
    worstSlackAt: place(slackAt, slackAt < 0 ? verts[0] : st.slackV),
    tightMapN: st.tightMap,
    slackMapN: st.slackMap,
  };
}

/** One row of a loop's tight and slack maps (rounded to 0.01 N), tracking the worst tight and slack side. */
function tensionRow(st: TensionGrid, iy: number): void {
  const { single, sv, f0, f1, n0, nxc, nyc, shares, va, vb, start, e, r, t0, inp, verts } = st;
  const { l0, lx, ly } = r;
  const ns = sv.length;
  const xs = inp.xMm;
  const ox = inp.originXMm;
  const nx = xs.length;
  let worstTight = st.worstTight;
  let worstSlack = st.worstSlack;
  const cy = inp.originYMm + inp.yMm[iy];
  const tRow = st.blank.slice();
  const sRow = st.blank.slice();
  for (let ix = 0; ix < nx; ix++) {
    const cx = ox + xs[ix];
    const total = l0 + lx * cx + ly * cy;
    let eHi = -Infinity;
    let eLo = Infinity;
    let hiV = 0;
    let loV = 0;
    if (single) {
      // One coordinate: a piece's change is c·F with c = u − Sᵢ, largest at the larger pull (vertex 1) when c ≥ 0
      // and at the smaller one (vertex 0) otherwise; written out here (the map's hot loop).
      const u = (n0 + nxc * cx + nyc * cy) / total;
      for (let i = 0; i < ns; i++) {
        const c = u - sv[i];
        const up = c >= 0;
        const th = c * (up ? f1 : f0);
        const tl = c * (up ? f0 : f1);
        if (th > eHi) {
          eHi = th;
          hiV = up ? 1 : 0;
        }
        if (tl < eLo) {
          eLo = tl;
          loV = up ? 0 : 1;
        }
      }
    } else {
      hullExtremes(shares, (r.a0 + r.ax * cx + r.ay * cy) / total, (r.b0 + r.bx * cx + r.by * cy) / total, va, vb, start, e);
      eHi = e.hi;
      eLo = e.lo;
      hiV = e.hiV;
      loV = e.loV;
    }
    const hi = t0 + eHi;
    const lo = t0 + eLo;
    tRow[ix] = Math.round(hi * 100) / 100;
    sRow[ix] = Math.round(lo * 100) / 100;
    if (hi > worstTight + 1e-9) {
      worstTight = hi;
      st.tightAt = iy * nx + ix;
      st.tightV = verts[hiV];
    }
    if (lo < worstSlack - 1e-9) {
      worstSlack = lo;
      st.slackAt = iy * nx + ix;
      st.slackV = verts[loV];
    }
  }
  st.worstTight = worstTight;
  st.worstSlack = worstSlack;
  st.tightMap.push(tRow);
  st.slackMap.push(sRow);
}
