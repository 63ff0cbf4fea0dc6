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

/** Sampling stride for a grid of `points` per axis: exact below 41 points, every other point up to 81, then every third. */
export function gridStride(points: number): number {
  return points <= 41 ? 1 : points <= 81 ? 2 : 3;
}

/**
 * A map over an nx × ny grid evaluated exactly at every `stride`-th point of each axis (and the last) and filled in
 * between by bilinear interpolation; then the extreme (`'min'` or `'max'`) is made exact: every point around the
 * extreme node is evaluated exactly, and so is every point whose interpolated value comes within `margin` of it.
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
  margin = 0.02,
): { values: number[][]; ix: number; iy: number } {
  const xs = nodes(nx, stride);
  const ys = nodes(ny, stride);
  const values: number[][] = Array.from({ length: ny }, () => new Array<number>(nx));
  const exact: boolean[][] = Array.from({ length: ny }, () => new Array<boolean>(nx).fill(false));
  for (const iy of ys) for (const ix of xs) ((values[iy][ix] = at(ix, iy)), (exact[iy][ix] = true));
  if (stride > 1) {
    // Interpolate along the exact rows, then down every column.
    for (const iy of ys) {
      for (let k = 0; k + 1 < xs.length; k++) {
        const a = xs[k];
        const b = xs[k + 1];
        for (let ix = a + 1; ix < b; ix++) values[iy][ix] = values[iy][a] + ((ix - a) / (b - a)) * (values[iy][b] - values[iy][a]);
      }
    }
    for (let k = 0; k + 1 < ys.length; k++) {
      const a = ys[k];
      const b = ys[k + 1];
      for (let iy = a + 1; iy < b; iy++) {
        const t = (iy - a) / (b - a);
        for (let ix = 0; ix < nx; ix++) values[iy][ix] = values[a][ix] + t * (values[b][ix] - values[a][ix]);
      }
    }
  }
  const better = (u: number, v: number) => (extreme === 'min' ? u < v : u > v);
  let best = { v: values[0][0], ix: 0, iy: 0 };
  for (let iy = 0; iy < ny; iy++) for (let ix = 0; ix < nx; ix++) if (better(values[iy][ix], best.v)) best = { v: values[iy][ix], ix, iy };
  if (stride > 1) {
    const threshold = extreme === 'min' ? best.v * (1 + margin) : best.v * (1 - margin);
    const near = (v: number) => (extreme === 'min' ? v <= threshold : v >= threshold);
    const todo: [number, number][] = [];
    for (let iy = 0; iy < ny; iy++)
      for (let ix = 0; ix < nx; ix++)
        if (!exact[iy][ix] && (near(values[iy][ix]) || (Math.abs(ix - best.ix) <= stride && Math.abs(iy - best.iy) <= stride)))
          todo.push([ix, iy]);
    for (const [ix, iy] of todo) {
      values[iy][ix] = at(ix, iy);
      if (better(values[iy][ix], best.v)) best = { v: values[iy][ix], ix, iy };
    }
  }
  return { values, ix: best.ix, iy: best.iy };
}
