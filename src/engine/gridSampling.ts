import { zeroRow } from './zeroRow';

// Smooth per-point quantities over the stiffness-map grid computed at every `stride`-th point and interpolated in
// between (docs/models/error-budget.md, docs/models/structural-modes.md): the belt stiffness, and with it the error
// budget and the yaw mode, changes slowly over the travel, so the fine map costs a fraction of a full evaluation.

/** Grid indices evaluated exactly: every `stride`-th, and always the last. */
function nodes(n: number, stride: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i += stride) out.push(i);
  if (out[out.length - 1] !== n - 1) out.push(n - 1);
  return out;
}

/** Most sample points whose neighbourhood is refined around the extreme. */
const MAX_REFINED = 4;

/**
 * Sampling stride for a grid of `points` per axis: every point up to 41, every other up to 81, then every third
 * (every fourth for the smoothest maps).
 * @param points - grid points per axis
 * @param isVerySmooth - the quantity varies slowly enough for a coarser sampling (the yaw mode)
 */
export function gridStride(points: number, isVerySmooth = false): number {
  return points <= 41 ? 1 : points <= 81 ? 2 : isVerySmooth ? 4 : 3;
}

/**
 * A map over an nx × ny grid evaluated exactly at every `stride`-th point of each axis (and the last) and filled in
 * between by bilinear interpolation; then the extreme (`'min'` or `'max'`) is made exact: every point between the
 * best sample and its neighbouring samples is evaluated exactly, and so around the few next-best samples within
 * `margin` of it.
 * @param nx - grid columns
 * @param ny - grid rows
 * @param stride - sampling stride (1: every point exact)
 * @param at - exact value at (ix, iy)
 * @param extreme - which extreme must be exact
 * @param margin - relative closeness to the extreme that earns an exact evaluation
 * @returns the map [iy][ix] and where its extreme is
 */
export function sampledGridMap(
  nx: number,
  ny: number,
  stride: number,
  at: (ix: number, iy: number) => number,
  extreme: 'min' | 'max',
  margin = 0.01,
): { values: number[][]; ix: number; iy: number } {
  const xs = nodes(nx, stride);
  const ys = nodes(ny, stride);
  // Rows of doubles from the start (zeroRow) keep one element kind for every later reader.
  const blank = zeroRow(nx);
  const values: number[][] = [];
  for (let iy = 0; iy < ny; iy++) values.push(blank.slice());
  const exact = new Uint8Array(nx * ny);
  for (const iy of ys) {
    for (const ix of xs) {
      values[iy][ix] = at(ix, iy);
      exact[iy * nx + ix] = 1;
    }
  }
  if (stride > 1) {
    // Interpolate along the exact rows, then down every column.
    for (const iy of ys) {
      const row = values[iy];
      for (let k = 0; k + 1 < xs.length; k++) {
        const a = xs[k];
        const b = xs[k + 1];
        for (let ix = a + 1; ix < b; ix++) row[ix] = row[a] + ((ix - a) / (b - a)) * (row[b] - row[a]);
      }
    }
    for (let k = 0; k + 1 < ys.length; k++) {
      const a = ys[k];
      const b = ys[k + 1];
      const rowA = values[a];
      const rowB = values[b];
      for (let iy = a + 1; iy < b; iy++) {
        const t = (iy - a) / (b - a);
        const row = values[iy];
        for (let ix = 0; ix < nx; ix++) row[ix] = rowA[ix] + t * (rowB[ix] - rowA[ix]);
      }
    }
  }
  const sign = extreme === 'min' ? 1 : -1;
  const better = (u: number, v: number) => sign * u < sign * v;
  // The extreme among the exact samples (interpolated points never beat their corners).
  let best = { v: values[ys[0]][xs[0]], ix: xs[0], iy: ys[0] };
  for (const iy of ys) for (const ix of xs) if (better(values[iy][ix], best.v)) best = { v: values[iy][ix], ix, iy };
  if (stride > 1) {
    // Exact values around the best sample and around every other sample within `margin` of it (at most a few: a
    // flat map would otherwise be evaluated whole), so the extreme the map reports is exact where it lies.
    const threshold = extreme === 'min' ? best.v * (1 + margin) : best.v * (1 - margin);
    const near = (v: number) => (extreme === 'min' ? v <= threshold : v >= threshold);
    const candidates: [number, number][] = [[best.ix, best.iy]];
    for (const iy of ys) for (const ix of xs) if ((ix !== best.ix || iy !== best.iy) && near(values[iy][ix])) candidates.push([ix, iy]);
    candidates.sort((a, b) => (extreme === 'min' ? values[a[1]][a[0]] - values[b[1]][b[0]] : values[b[1]][b[0]] - values[a[1]][a[0]]));
    for (const [cx, cy] of candidates.slice(0, MAX_REFINED)) {
      for (let iy = Math.max(0, cy - stride + 1); iy <= Math.min(ny - 1, cy + stride - 1); iy++) {
        for (let ix = Math.max(0, cx - stride + 1); ix <= Math.min(nx - 1, cx + stride - 1); ix++) {
          if (exact[iy * nx + ix]) continue;
          values[iy][ix] = at(ix, iy);
          exact[iy * nx + ix] = 1;
          if (better(values[iy][ix], best.v)) best = { v: values[iy][ix], ix, iy };
        }
      }
    }
  }
  return { values, ix: best.ix, iy: best.iy };
}
