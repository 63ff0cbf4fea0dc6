/**
 * The floor the engine figure is compared with: a plain loop doing the arithmetic one evaluation does at map size,
 * on typed arrays, with nothing else (no schema, no belt layout, no result objects, no number[][] maps, no
 * closures). The stage is a made-up crossed-belt one shaped like the demo designs at 101 points: 4 belt pieces
 * that all change with X and Y (2 groups without yaw, 4 with), 2 loops each pulled by one motor coordinate with 2
 * distinct piece coefficients, 3 modes (belt, gantry bending, gantry yaw), a symmetric error budget (18 directions
 * on the map). It includes, per grid point (points × points):
 * - the stiffness map (src/engine/stiffness.ts, stiffnessMap): group springs from the column and row tables plus
 *   EA/L of every piece that changes with both, the 15 products per group, the condensation of three motor
 *   coordinates, the lowest eigenvalue with the X and Y masses, the weakest point;
 * - the belt tension map of every loop (src/engine/beltTensionMap.ts, loopOverTravel with singleExtremes): the
 *   loop's pull share u, each distinct coefficient's highest and lowest change, both maps rounded to 0.01 N, the
 *   worst tight and slack side;
 * - the lowest-mode map (src/engine/structuralModes.ts, lowestModeMap): each mode's lowest point, then the lowest
 *   mode at every point with each mode's top where it is lowest;
 * - the gantry yaw map (src/engine/gantryYaw.ts, gantryYawMap through src/engine/gridSampling.ts): exact at every
 *   4th point (and the last) plus the points around the lowest sample — yaw group springs, the 21 products, the
 *   condensation with the yaw row, the 3 × 3 eigenproblem of yawPointHz — and bilinear interpolation in between;
 * - the error-budget map (src/engine/errorBudget.ts, errorBudgetMap through gridSampling.ts): exact at every 3rd
 *   point plus the points around the highest sample — the belt compliance and 18 directions — interpolation in
 *   between, and the worst point in all 360 directions;
 * - per column, the gantry bending frequency and the yaw mass data (src/engine/secondLayer.ts, modesSection and
 *   yawMap; src/engine/structuralModes.ts).
 * Per direction (360): the envelope (src/engine/envelope.ts, samplePullCurve on the phasor torque model of
 * src/engine/motorTorque.ts and computeEnvelope: speed limit by binary search of the pull floor, rest and cruise
 * limits, 4 pull pairs), the effective mass (src/engine/mass.ts), the error budget's forces and load angles
 * (src/engine/secondLayer.ts, errorBudgetSection), the heat section's mechanical power and the excitation's belt
 * speeds (secondLayer.ts), the worst-direction scans (src/engine/evaluateDesign.ts) and the 121-point torque chart.
 * Only the refinement around the single best sample is counted (the engine refines around up to four), so the
 * floor stays a floor. Same sizes as the engine's run: the ratio engine ÷ floor says how much the engine spends
 * beyond the arithmetic.
 */

const PIECES = 4;
const GROUPS = 2;
const YAW_GROUPS = 4;
const LOOPS = 2;
const SHARES = 2;
const MODES = 3;
const DIRECTIONS = 360;
const ERROR_DIRECTIONS = 18;
const CURVE = 513;
const YAW_STRIDE = 4;
const ERROR_STRIDE = 3;
const ORIGIN = 20;
const TRAVEL = 300;
const EA = 60000 * 1000;
const X_KG = 0.9;
const Y_KG = 1.6;
const TWO_PI = 2 * Math.PI;

/** Inputs shaped like a crossed-belt stage, made once. */
export interface FloorInputs {
  l0: Float64Array;
  gx: Float64Array;
  gy: Float64Array;
  /** Group of each piece without and with the yaw slope. */
  groupOf: Int32Array;
  yawGroupOf: Int32Array;
  /** Products per group: 15 without yaw, 21 with. */
  coef: Float64Array;
  yawCoef: Float64Array;
  h0: Float64Array;
  /** Per loop: share-ratio coefficients (l0 lx ly a0 ax ay) and the distinct piece coefficients. */
  ratio: Float64Array;
  shares: Float64Array;
  /** Per error direction: Fx², 2·Fx·Fy, Fy² and the load-angle error. */
  fa: Float64Array;
  fb: Float64Array;
  fc: Float64Array;
  la: Float64Array;
}

/**
 * Inputs of the floor, made once (not timed).
 * @returns the made-up stage's piece data and tables
 */
export function floorInputs(): FloorInputs {
  const l0 = Float64Array.of(400, 700, 400, 400);
  const gx = Float64Array.of(1, -1, 1, -1);
  const gy = Float64Array.of(1, -1, -1, 1);
  const gf = [0.1, -0.05, 0.08, -0.12];
  const t = [
    [1, 0, 0],
    [-1, 0, 0],
    [0, 1, 0],
    [0, -1, 0],
  ];
  const products = (v: number[]) => {
    const out: number[] = [];
    for (let i = 0; i < v.length; i++) for (let j = i; j < v.length; j++) out.push(v[i] * v[j]);
    return out;
  };
  const coef = Float64Array.from([...products([1, 1, 1, 0, 0]), ...products([1, -1, 0, 1, 0])]);
  const yawCoef = Float64Array.from(Array.from({ length: PIECES }, (_, r) => products([gx[r], gy[r], gf[r], ...t[r]])).flat());
  const ratio = Float64Array.of(1100, 0, 0, 700, -1, -1, 800, 0, 0, 400, -1, 1);
  const shares = Float64Array.of(0, 1, 0, -1);
  const fa = new Float64Array(ERROR_DIRECTIONS);
  const fb = new Float64Array(ERROR_DIRECTIONS);
  const fc = new Float64Array(ERROR_DIRECTIONS);
  const la = new Float64Array(ERROR_DIRECTIONS);
  for (let j = 0; j < ERROR_DIRECTIONS; j++) {
    const fx = 20 * Math.cos((j * Math.PI) / ERROR_DIRECTIONS) + 2;
    const fy = 30 * Math.sin((j * Math.PI) / ERROR_DIRECTIONS) + 3;
    fa[j] = fx * fx;
    fb[j] = 2 * fx * fy;
    fc[j] = fy * fy;
    la[j] = 0.01 + 0.002 * j;
  }
  return {
    l0,
    gx,
    gy,
    groupOf: Int32Array.of(0, 0, 1, 1),
    yawGroupOf: Int32Array.of(0, 1, 2, 3),
    coef,
    yawCoef,
    h0: Float64Array.of(2e5, 0, 0, 2e5, 0, 1),
    ratio,
    shares,
    fa,
    fb,
    fc,
    la,
  };
}

/** Work space of one run: the grid, the tables and the maps, all typed arrays. */
interface Space {
  n: number;
  xs: Float64Array;
  colG: Float64Array;
  rowG: Float64Array;
  kg: Float64Array;
  out: Float64Array;
  /** Sums of the yaw condensation's 15 carriage-row products. */
  acc: Float64Array;
  kxx: Float64Array;
  kxy: Float64Array;
  kyy: Float64Array;
  belt: Float64Array;
  bend: Float64Array;
  yaw: Float64Array;
  err: Float64Array;
  exact: Uint8Array;
  /** Yaw mass data per column: y mass, coupling, inertia. */
  my: Float64Array;
  mc: Float64Array;
  mj: Float64Array;
}

function space(points: number): Space {
  const n = points;
  const xs = new Float64Array(n);
  for (let i = 0; i < n; i++) xs[i] = (TRAVEL * i) / (n - 1);
  const f = () => new Float64Array(n * n);
  return {
    n,
    xs,
    colG: new Float64Array(YAW_GROUPS * n),
    rowG: new Float64Array(YAW_GROUPS * n),
    kg: new Float64Array(YAW_GROUPS),
    out: new Float64Array(6),
    acc: new Float64Array(15),
    kxx: f(),
    kxy: f(),
    kyy: f(),
    belt: f(),
    bend: new Float64Array(n),
    yaw: f(),
    err: f(),
    exact: new Uint8Array(n * n),
    my: new Float64Array(n),
    mc: new Float64Array(n),
    mj: new Float64Array(n),
  };
}

/** src/engine/stiffness.ts stiffnessMap: the belt mode at every point; returns the checksum part. */
function stiffnessPart(inp: FloorInputs, s: Space): number {
  const { n, xs, colG, rowG, kg, kxx, kxy, kyy, belt } = s;
  const { l0, gx, gy, groupOf, coef, h0 } = inp;
  const sqrtMass = Math.sqrt(X_KG * Y_KG);
  let best = Infinity;
  for (let iy = 0; iy < n; iy++) {
    const cy = ORIGIN + xs[iy];
    for (let ix = 0; ix < n; ix++) {
      for (let g = 0; g < GROUPS; g++) kg[g] = colG[g * n + ix] + rowG[g * n + iy];
      const cx = ORIGIN + xs[ix];
      for (let r = 0; r < PIECES; r++) {
        const len = l0[r] + gx[r] * cx + gy[r] * cy;
        kg[groupOf[r]] += EA / (len > 1e-3 ? len : 1e-3);
      }
      let xx = 0,
        xy = 0,
        x0 = 0,
        x1 = 0,
        x2 = 0,
        yy = 0,
        y0 = 0,
        y1 = 0,
        y2 = 0;
      let h00 = h0[0],
        h01 = h0[1],
        h02 = h0[2],
        h11 = h0[3],
        h12 = h0[4],
        h22 = h0[5];
      for (let g = 0; g < GROUPS; g++) {
        const k = kg[g];
        const o = g * 15;
        xx += k * coef[o];
        xy += k * coef[o + 1];
        x0 += k * coef[o + 2];
        x1 += k * coef[o + 3];
        x2 += k * coef[o + 4];
        yy += k * coef[o + 5];
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
      const p = iy * n + ix;
      const cxx = Math.abs(xx - (x0 * x0) / h00 - (x1b * x1b) / d1 - (x2b * x2b) / d2);
      const cxy = xy - (x0 * y0) / h00 - (x1b * y1b) / d1 - (x2b * y2b) / d2;
      const cyy = Math.abs(yy - (y0 * y0) / h00 - (y1b * y1b) / d1 - (y2b * y2b) / d2);
      kxx[p] = cxx;
      kxy[p] = cxy;
      kyy[p] = cyy;
      const a = cxx / X_KG;
      const d = cyy / Y_KG;
      const b = cxy / sqrtMass;
      const lam = (a + d) / 2 - Math.sqrt(((a - d) / 2) * ((a - d) / 2) + b * b);
      const hz = Math.sqrt(lam > 0 ? lam : 0) / TWO_PI;
      belt[p] = hz;
      if (hz < best - 1e-9) best = hz;
    }
  }
  return best;
}

/** src/engine/beltTensionMap.ts loopOverTravel (one coordinate per loop): both maps of every loop. */
function tensionPart(inp: FloorInputs, s: Space, tight: Float64Array, slack: Float64Array): number {
  const { n, xs } = s;
  const t0 = 40;
  const f0 = -35;
  const f1 = 42;
  let worst = 0;
  for (let loop = 0; loop < LOOPS; loop++) {
    const o = loop * 6;
    const [l0, lx, ly, a0, ax, ay] = inp.ratio.subarray(o, o + 6);
    let worstTight = -Infinity;
    let worstSlack = Infinity;
    for (let iy = 0; iy < n; iy++) {
      const cy = ORIGIN + xs[iy];
      for (let ix = 0; ix < n; ix++) {
        const cx = ORIGIN + xs[ix];
        const u = (a0 + ax * cx + ay * cy) / (l0 + lx * cx + ly * cy);
        let hi = -Infinity;
        let lo = Infinity;
        for (let i = 0; i < SHARES; i++) {
          const c = u - inp.shares[loop * SHARES + i];
          const up = c >= 0;
          const th = c * (up ? f1 : f0);
          const tl = c * (up ? f0 : f1);
          if (th > hi) hi = th;
          if (tl < lo) lo = tl;
        }
        const p = iy * n + ix;
        tight[p] = Math.round((t0 + hi) * 100) / 100;
        slack[p] = Math.round((t0 + lo) * 100) / 100;
        if (t0 + hi > worstTight + 1e-9) worstTight = t0 + hi;
        if (t0 + lo < worstSlack - 1e-9) worstSlack = t0 + lo;
      }
    }
    worst += worstTight - worstSlack;
  }
  return worst;
}

/** src/engine/gantryYaw.ts yawPointHz: the lowest yaw mode of one point's 3 × 3 problem [Hz]. */
function yawPointHz(k: Float64Array, mx: number, my: number, c: number, j: number, half: number): number {
  const l11 = Math.sqrt(mx);
  const l22 = Math.sqrt(my);
  const l32 = c / l22;
  const l33 = Math.sqrt(j - l32 * l32);
  const a11 = k[0] / mx;
  const a12 = k[1] / (l11 * l22);
  const a13 = (k[3] - (l32 * k[1]) / l22) / (l11 * l33);
  const a22 = k[2] / my;
  const a23 = (k[4] / l22 - (l32 * k[2]) / my) / l33;
  const a33 = (k[5] - (2 * l32 * k[4]) / l22 + (l32 * l32 * k[2]) / my) / (l33 * l33);
  const q = (a11 + a22 + a33) / 3;
  const p1 = a12 * a12 + a13 * a13 + a23 * a23;
  const p = Math.sqrt(((a11 - q) ** 2 + (a22 - q) ** 2 + (a33 - q) ** 2 + 2 * p1) / 6);
  const b11 = (a11 - q) / p;
  const b22 = (a22 - q) / p;
  const b33 = (a33 - q) / p;
  const b12 = a12 / p;
  const b13 = a13 / p;
  const b23 = a23 / p;
  const r = (b11 * (b22 * b33 - b23 * b23) - b12 * (b12 * b33 - b23 * b13) + b13 * (b12 * b23 - b22 * b13)) / 2;
  const phi = Math.acos(r < -1 ? -1 : r > 1 ? 1 : r) / 3;
  const e2 = q + 2 * p * Math.cos(phi);
  const e0 = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
  const e1 = 3 * q - e0 - e2;
  for (let i = 0; i < 3; i++) {
    const lam = i === 0 ? e0 : i === 1 ? e1 : e2;
    const r00 = a11 - lam;
    const r11 = a22 - lam;
    const r22 = a33 - lam;
    let vx = a12 * a23 - a13 * r11;
    let vy = a13 * a12 - r00 * a23;
    let vz = r00 * r11 - a12 * a12;
    let nn = vx * vx + vy * vy + vz * vz;
    const ux = a12 * r22 - a13 * a23;
    const uy = a13 * a13 - r00 * r22;
    const uz = r00 * a23 - a12 * a13;
    const nu = ux * ux + uy * uy + uz * uz;
    if (nu > nn) {
      vx = ux;
      vy = uy;
      vz = uz;
      nn = nu;
    }
    const wx = r11 * r22 - a23 * a23;
    const wy = a23 * a13 - a12 * r22;
    const wz = a12 * a23 - r11 * a13;
    if (wx * wx + wy * wy + wz * wz > nn) {
      vx = wx;
      vy = wy;
      vz = wz;
    }
    const u3 = vz / l33;
    const u2 = (vy - l32 * u3) / l22;
    const u1 = vx / l11;
    if (Math.abs(u3) * half > Math.max(Math.abs(u1), Math.abs(u2))) return lam > 0 ? Math.sqrt(lam) / TWO_PI : 0;
  }
  return e2 > 0 ? Math.sqrt(e2) / TWO_PI : 0;
}

/** src/engine/stiffness.ts condensePoint and gantryYaw.ts gantryYawMap: the yaw mode at one point [Hz]. */
function yawAt(inp: FloorInputs, s: Space, ix: number, iy: number): number {
  const { n, xs, colG, rowG, kg, out } = s;
  const { l0, gx, gy, yawGroupOf, yawCoef: coef, h0 } = inp;
  for (let g = 0; g < YAW_GROUPS; g++) kg[g] = colG[g * n + ix] + rowG[g * n + iy];
  const cx = ORIGIN + xs[ix];
  const cy = ORIGIN + xs[iy];
  for (let r = 0; r < PIECES; r++) {
    const len = l0[r] + gx[r] * cx + gy[r] * cy;
    kg[yawGroupOf[r]] += EA / (len > 1e-3 ? len : 1e-3);
  }
  const a = s.acc;
  a.fill(0);
  let h00 = h0[0],
    h01 = h0[1],
    h02 = h0[2],
    h11 = h0[3],
    h12 = h0[4],
    h22 = h0[5];
  for (let g = 0; g < YAW_GROUPS; g++) {
    const k = kg[g];
    const o = g * 21;
    for (let c = 0; c < 15; c++) a[c] += k * coef[o + c];
    h00 += k * coef[o + 15];
    h01 += k * coef[o + 16];
    h02 += k * coef[o + 17];
    h11 += k * coef[o + 18];
    h12 += k * coef[o + 19];
    h22 += k * coef[o + 20];
  }
  // a: xx xy xf x0 x1 x2 | yy yf y0 y1 y2 | ff f0 f1 f2
  const f10 = h01 / h00;
  const f20 = h02 / h00;
  const d1 = h11 - f10 * h01;
  const e12 = h12 - f10 * h02;
  const f21 = e12 / d1;
  const d2 = h22 - f20 * h02 - f21 * e12;
  const x1b = a[4] - f10 * a[3];
  const y1b = a[9] - f10 * a[8];
  const f1b = a[13] - f10 * a[12];
  const x2b = a[5] - f20 * a[3] - f21 * x1b;
  const y2b = a[10] - f20 * a[8] - f21 * y1b;
  const f2b = a[14] - f20 * a[12] - f21 * f1b;
  const p = iy * n + ix;
  out[0] = s.kxx[p];
  out[1] = s.kxy[p];
  out[2] = s.kyy[p];
  out[3] = a[2] - (a[3] * a[12]) / h00 - (x1b * f1b) / d1 - (x2b * f2b) / d2;
  out[4] = a[7] - (a[8] * a[12]) / h00 - (y1b * f1b) / d1 - (y2b * f2b) / d2;
  out[5] = Math.abs(a[11] - (a[12] * a[12]) / h00 - (f1b * f1b) / d1 - (f2b * f2b) / d2) + 1;
  return yawPointHz(out, X_KG, s.my[ix], s.mc[ix], s.mj[ix], 0.2);
}

/** src/engine/errorBudget.ts errorBudgetMap (pointTotal): the worst error at one point over 18 directions [mm]. */
function errorAt(inp: FloorInputs, s: Space, ix: number, iy: number): number {
  const p = iy * s.n + ix;
  const a = s.kxx[p];
  const b = s.kxy[p];
  const d = s.kyy[p];
  const det = a * d - b * b;
  const c11 = d / det - 1e-7;
  const c12 = -b / det;
  const c22 = a / det - 1e-7;
  const g11 = (c11 * c11 + c12 * c12) * 1e6;
  const g12 = c12 * (c11 + c22) * 1e6;
  const g22 = (c12 * c12 + c22 * c22) * 1e6;
  let best = 0;
  for (let j = 0; j < ERROR_DIRECTIONS; j++) {
    const t = Math.sqrt(g11 * inp.fa[j] + g12 * inp.fb[j] + g22 * inp.fc[j]) + inp.la[j];
    if (t > best) best = t;
  }
  return best + 0.02;
}

/**
 * src/engine/gridSampling.ts sampledGridMap: exact at every `stride`-th point (and the last), the points around
 * the best sample, bilinear in between. `which` 0: yaw (lowest), 1: error (highest).
 */
function sampledPart(inp: FloorInputs, s: Space, which: 0 | 1, stride: number, map: Float64Array): number {
  const { n, exact } = s;
  exact.fill(0);
  const sign = which === 0 ? 1 : -1;
  let best = Infinity;
  let bx = 0;
  let by = 0;
  for (let iy = 0; iy < n; iy = iy + stride >= n && iy !== n - 1 ? n - 1 : iy + stride) {
    for (let ix = 0; ix < n; ix = ix + stride >= n && ix !== n - 1 ? n - 1 : ix + stride) {
      const v = which === 0 ? yawAt(inp, s, ix, iy) : errorAt(inp, s, ix, iy);
      map[iy * n + ix] = v;
      exact[iy * n + ix] = 1;
      if (sign * v < best) {
        best = sign * v;
        bx = ix;
        by = iy;
      }
    }
  }
  // Rows through the exact points, then every column.
  for (let iy = 0; iy < n; iy++) {
    if (!exact[iy * n]) continue;
    for (let a = 0; a < n - 1;) {
      const b = Math.min(n - 1, a + stride);
      for (let ix = a + 1; ix < b; ix++) map[iy * n + ix] = map[iy * n + a] + ((ix - a) / (b - a)) * (map[iy * n + b] - map[iy * n + a]);
      a = b;
    }
  }
  for (let a = 0; a < n - 1;) {
    const b = Math.min(n - 1, a + stride);
    for (let iy = a + 1; iy < b; iy++) {
      const t = (iy - a) / (b - a);
      for (let ix = 0; ix < n; ix++) map[iy * n + ix] = map[a * n + ix] + t * (map[b * n + ix] - map[a * n + ix]);
    }
    a = b;
  }
  for (let iy = Math.max(0, by - stride + 1); iy <= Math.min(n - 1, by + stride - 1); iy++) {
    for (let ix = Math.max(0, bx - stride + 1); ix <= Math.min(n - 1, bx + stride - 1); ix++) {
      if (exact[iy * n + ix]) continue;
      const v = which === 0 ? yawAt(inp, s, ix, iy) : errorAt(inp, s, ix, iy);
      map[iy * n + ix] = v;
      if (sign * v < best) best = sign * v;
    }
  }
  return sign * best;
}

/** src/engine/structuralModes.ts lowestModeMap: each mode's lowest point, the lowest mode per point, each mode's top. */
function lowestModePart(s: Space, lowest: Float64Array, modeOf: Uint8Array): number {
  const { n, belt, bend, yaw } = s;
  let sum = 0;
  for (let m = 0; m < MODES; m++) {
    let bestF = Infinity;
    for (let iy = 0; iy < n; iy++) {
      for (let ix = 0; ix < n; ix++) {
        const v = m === 0 ? belt[iy * n + ix] : m === 1 ? bend[ix] : yaw[iy * n + ix];
        if (v < bestF - 1e-9) bestF = v;
      }
    }
    sum += bestF;
  }
  let lowestHz = Infinity;
  let top0 = 0,
    top1 = 0,
    top2 = 0;
  for (let iy = 0; iy < n; iy++) {
    for (let ix = 0; ix < n; ix++) {
      const p = iy * n + ix;
      let f = belt[p];
      let k = 0;
      if (bend[ix] < f) {
        f = bend[ix];
        k = 1;
      }
      if (yaw[p] < f) {
        f = yaw[p];
        k = 2;
      }
      if (k === 0) top0 = Math.max(top0, f);
      else if (k === 1) top1 = Math.max(top1, f);
      else top2 = Math.max(top2, f);
      lowest[p] = f;
      modeOf[p] = k;
      if (f < lowestHz - 1e-9) lowestHz = f;
    }
  }
  return sum + lowestHz + top0 + top1 + top2;
}

/** One side's integral of structuralModes.ts beamEffectiveMassShare. */
function massPart(p: number, q: number): number {
  const c = 1 - q * q;
  return q * q * ((c * c * p ** 3) / 3 - (2 * c * p ** 5) / 5 + p ** 7 / 7);
}

/** Per column: gantry bending (structuralModes.ts beamBendingFrequencyHz) and yaw mass data (gantryYawMass). */
function columnPart(s: Space): void {
  const span = 0.38;
  for (let ix = 0; ix < s.n; ix++) {
    const a = Math.min(1 - 1e-3, Math.max(1e-3, (ORIGIN + s.xs[ix]) / 1000 / span));
    const b = 1 - a;
    const share = (massPart(a, b) + massPart(b, a)) / (4 * a ** 4 * b ** 4);
    const k = (3 * 69e9 * 7e-9 * span) / (a * span * a * span * b * span * b * span);
    s.bend[ix] = Math.sqrt(k / (0.4 + 0.6 * share)) / TWO_PI;
    const e = (ORIGIN + s.xs[ix] - 190) / 1000;
    s.my[ix] = Y_KG + 0.4;
    s.mc[ix] = 0.4 * e;
    s.mj[ix] = (0.6 * span * span) / 12 + 0.4 * e * e;
  }
}

/** src/engine/motorTorque.ts pullOutAt: the phasor model's pull-out torque at a shaft speed [N·m]. */
function pullOut(omega: number): number {
  const kt = 0.3;
  const rr = 1.8;
  const iPeak = 1.7;
  const v = 24;
  const e = kt * omega;
  const x = 50 * omega * 3.2e-3;
  const z2 = rr * rr + x * x;
  const z = Math.sqrt(z2);
  const rho = v / z;
  const cq = (-e * rr) / z2;
  const cd = (e * x) / z2;
  const d = e / z;
  if ((iPeak - cq) ** 2 + cd * cd <= rho * rho * (1 + 1e-12)) return kt * iPeak;
  const vq = cq + rho;
  if (vq * vq + cd * cd <= iPeak * iPeak * (1 + 1e-12)) return Math.max(0, kt * vq);
  if (d >= iPeak + rho || d === 0) return 0;
  const a = (iPeak * iPeak - rho * rho + d * d) / (2 * d);
  const h = Math.sqrt(Math.max(0, iPeak * iPeak - a * a));
  return Math.max(0, (kt * (a * cq + h * Math.abs(cd))) / d);
}

/** Highest speed whose pull floor covers a need: envelope.ts beltSpeedForPull. */
function speedFor(floor: Float64Array, speeds: Float64Array, need: number): number {
  if (floor[0] < need) return 0;
  if (floor[CURVE - 1] >= need) return speeds[CURVE - 1];
  let lo = 0;
  let hi = CURVE - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (floor[mid] >= need) lo = mid;
    else hi = mid;
  }
  const t = floor[lo] === floor[hi] ? 0 : (floor[lo] - need) / (floor[lo] - floor[hi]);
  return speeds[lo] + t * (speeds[hi] - speeds[lo]);
}

/** Pull at a speed: envelope.ts pullAtSpeed. */
function pullAt(pull: Float64Array, top: number, v: number): number {
  if (v >= top) return v === top ? pull[CURVE - 1] : 0;
  const x = (v / top) * (CURVE - 1);
  const i = Math.floor(x);
  return pull[i] + (x - i) * (pull[i + 1] - pull[i]);
}

/** The 360 directions: envelope, effective mass, error-budget forces, heat, excitation, scans, torque chart. */
function directionPart(): number {
  const r = 0.0064;
  const top = 40;
  const speeds = new Float64Array(CURVE);
  const pull = new Float64Array(CURVE);
  const floor = new Float64Array(CURVE);
  let min = Infinity;
  for (let i = 0; i < CURVE; i++) {
    speeds[i] = (top * i) / (CURVE - 1);
    pull[i] = Math.max(0, (0.6 * pullOut(speeds[i] / r)) / r);
    min = Math.min(min, pull[i]);
    floor[i] = min;
  }
  const pa = new Float64Array(4 * DIRECTIONS);
  const pb = new Float64Array(4 * DIRECTIONS);
  let sum = 0;
  let worst = Infinity;
  for (let i = 0; i < DIRECTIONS; i++) {
    const th = (i * Math.PI) / 180;
    const c = Math.cos(th);
    const s = Math.sin(th);
    const sa = c + s;
    const sb = c - s;
    const fx = 2 * Math.sign(c);
    const fy = 3 * Math.sign(s);
    const carA = 0.5 * (X_KG * c + Y_KG * s);
    const carB = 0.5 * (X_KG * c - Y_KG * s);
    const alphaA = carA + 0.05 * sa;
    const alphaB = carB + 0.05 * sb;
    const betaA = 0.5 * (fx + fy);
    const betaB = 0.5 * (fx - fy);
    let vmax = Infinity;
    if (Math.abs(sa) > 1e-12) vmax = Math.min(vmax, speedFor(floor, speeds, Math.abs(betaA)) / Math.abs(sa));
    if (Math.abs(sb) > 1e-12) vmax = Math.min(vmax, speedFor(floor, speeds, Math.abs(betaB)) / Math.abs(sb));
    const rest = Math.min(
      (pull[0] - Math.sign(alphaA) * betaA) / Math.abs(alphaA),
      (pull[0] - Math.sign(alphaB) * betaB) / Math.abs(alphaB),
    );
    const pA = pullAt(pull, top, Math.abs(sa) * 0.3);
    const pB = pullAt(pull, top, Math.abs(sb) * 0.3);
    const cruise = Math.min((pA - Math.sign(alphaA) * betaA) / Math.abs(alphaA), (pB - Math.sign(alphaB) * betaB) / Math.abs(alphaB));
    for (let q = 0; q < 4; q++) {
      const a = q < 2 ? rest : cruise;
      const sg = q % 2 === 0 ? 1 : -1;
      pa[4 * i + q] = sg * (carA + 0.02 * sa) * a + betaA;
      pb[4 * i + q] = sg * (carB + 0.02 * sb) * a + betaB;
      sum += Math.abs(pa[4 * i + q]) + Math.abs(pb[4 * i + q]);
    }
    // Effective mass (mass.ts), error-budget forces and load angles (secondLayer.ts), heat and excitation shares.
    const mass = X_KG * c * c + Y_KG * s * s + 0.05 * sa * sa + 0.05 * sb * sb;
    const a = Math.min(3, rest);
    const c2 = Math.cos(th);
    const s2 = Math.sin(th);
    const ma = 0.5 * (X_KG * c2 * a + fx + Y_KG * s2 * a + fy) + 0.05 * sa * a;
    const mb = 0.5 * (X_KG * c2 * a + fx - Y_KG * s2 * a - fy) + 0.05 * sb * a;
    const lagA = (6.4 * Math.asin(Math.max(-1, Math.min(1, (ma * r) / 0.4)))) / 50;
    const lagB = (6.4 * Math.asin(Math.max(-1, Math.min(1, (mb * r) / 0.4)))) / 50;
    const heat = Math.max(Math.abs(ma * sa), Math.abs(mb * sb)) * 0.3;
    sum += mass + Math.hypot(0.5 * (lagA + lagB), 0.5 * (lagA - lagB)) + heat + Math.max(Math.abs(sa), Math.abs(sb)) * vmax;
    if (rest < worst - 1e-12) worst = rest;
  }
  for (let i = 0; i < 121; i++) sum += pullOut((TWO_PI * 25 * i) / 120);
  return sum + worst;
}

/**
 * One floor run.
 * @param inp - the inputs of floorInputs
 * @param points - grid points per side (101 for the figure)
 * @returns a checksum, so the work cannot be optimised away
 */
export function floorRun(inp: FloorInputs, points: number): number {
  const s = space(points);
  const n = s.n;
  columnPart(s);
  let sum = stiffnessPart(inp, s);
  const tight = new Float64Array(n * n);
  const slack = new Float64Array(n * n);
  sum += tensionPart(inp, s, tight, slack);
  sum += sampledPart(inp, s, 0, YAW_STRIDE, s.yaw);
  sum += sampledPart(inp, s, 1, ERROR_STRIDE, s.err);
  // The worst error point in every direction (errorBudgetMap).
  for (let i = 0; i < DIRECTIONS; i++) sum += Math.hypot(s.kxx[i] * 1e-9 * Math.cos(i), s.kyy[i] * 1e-9 * Math.sin(i)) * 1e-3;
  const lowest = new Float64Array(n * n);
  const modeOf = new Uint8Array(n * n);
  sum += lowestModePart(s, lowest, modeOf);
  sum += directionPart();
  return sum + tight[n] + slack[n] + s.err[n] + lowest[n] + modeOf[n];
}
