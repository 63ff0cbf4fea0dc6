import { solveLoop, type BeltLayout, type LayoutLoop } from './beltLayout';
import { sampledGridMap } from './gridSampling';
import type { YawMass } from './structuralModes';

// Gantry yaw from the belt layout (docs/models/structural-modes.md): how each belt piece's length changes when the
// gantry, with the carriage on it, turns about the vertical axis, and the yaw mode over the travel grid.

/** Small yaw angle for the central difference [rad]: far below any real twist, far above round-off. */
const YAW_STEP_RAD = 1e-4;

/** A copy of a loop whose gantry and carriage elements are turned by φ about (xm, cyc). */
function turned(loop: LayoutLoop, phi: number, xmMm: number, cxcMm: number): LayoutLoop {
  return {
    ...loop,
    elements: loop.elements.map((e) => {
      if (e.body === 'frame') return e;
      // Element position relative to the turning point: gantry elements sit at absolute X, carriage elements
      // relative to the carriage centre; both sit baseYMm off the gantry's belt line.
      const x = e.body === 'gantry' ? e.baseXMm - xmMm : e.baseXMm + cxcMm - xmMm;
      return { ...e, baseXMm: e.baseXMm - phi * e.baseYMm, baseYMm: e.baseYMm + phi * x };
    }),
  };
}

/**
 * Change of every belt piece's length per radian of gantry yaw (gantry and carriage turning together about the
 * vertical axis through the gantry's mid-point), by a central difference on the solved belt path.
 * @param layout - belt layout
 * @param cxcMm - carriage centre X in frame coordinates [mm]
 * @param cycMm - carriage centre Y in frame coordinates [mm]
 * @returns per loop, per piece (the order of solveLoop's pieces) [mm/rad]
 * @see docs/models/structural-modes.md
 */
export function yawSlopesMmPerRad(layout: BeltLayout, cxcMm: number, cycMm: number): number[][] {
  const xm = layout.outerXMm / 2;
  return layout.loops.map((loop) => {
    const plus = solveLoop(turned(loop, YAW_STEP_RAD, xm, cxcMm), cxcMm, cycMm).pieces;
    const minus = solveLoop(turned(loop, -YAW_STEP_RAD, xm, cxcMm), cxcMm, cycMm).pieces;
    return plus.map((p, i) => {
      const g = (p.lengthMm - minus[i].lengthMm) / (2 * YAW_STEP_RAD);
      // Round-off of the path solver is ~1e-9 mm; slopes below this are zero.
      return Math.abs(g) < 1e-4 ? 0 : g;
    });
  });
}

/**
 * Yaw frequency of one grid point, in scalars (the map calls it at every point): Cholesky of the mass matrix
 * [[m_x, 0, 0], [0, m_y, c], [0, c, J]], the symmetric 3 × 3 A = L⁻¹·K·L⁻ᵀ, its eigenvalues by the trigonometric
 * solution of the characteristic cubic (O. K. Smith, Comm. ACM 4(4), 1961), and for each eigenvalue the eigenvector
 * from the largest cross product of two rows of A − λI, mapped back by L⁻ᵀ. The first (lowest) mode whose rotation
 * moves the gantry ends more than its translations move anything is the yaw mode. Same result as
 * {@link yawModeFrequencyHz}, without allocations.
 * @returns yaw frequency [Hz]; 0 when the belts leave a mechanism (an eigenvalue ≈ 0 whose mode turns the gantry)
 */
function yawPointHz(k: number[], mx: number, my: number, c: number, j: number, half: number): number {
  const l11 = Math.sqrt(mx);
  const l22 = Math.sqrt(my);
  const l32 = c / l22;
  const l33 = Math.sqrt(j - l32 * l32);
  // K entries: k[0] xx, k[1] xy, k[2] yy, k[3] xφ, k[4] yφ, k[5] φφ. A = L⁻¹ K L⁻ᵀ with L lower triangular.
  const a11 = k[0] / mx;
  const a12 = k[1] / (l11 * l22);
  const a13 = (k[3] - (l32 * k[1]) / l22) / (l11 * l33);
  const a22 = k[2] / my;
  const a23 = (k[4] / l22 - (l32 * k[2]) / my) / l33;
  const a33 = (k[5] - (2 * l32 * k[4]) / l22 + (l32 * l32 * k[2]) / my) / (l33 * l33);
  const q = (a11 + a22 + a33) / 3;
  const p1 = a12 * a12 + a13 * a13 + a23 * a23;
  const p2 = (a11 - q) ** 2 + (a22 - q) ** 2 + (a33 - q) ** 2 + 2 * p1;
  const p = Math.sqrt(p2 / 6);
  let e0: number, e1: number, e2: number;
  if (p === 0) {
    e0 = e1 = e2 = q;
  } else {
    const b11 = (a11 - q) / p;
    const b22 = (a22 - q) / p;
    const b33 = (a33 - q) / p;
    const b12 = a12 / p;
    const b13 = a13 / p;
    const b23 = a23 / p;
    const r = (b11 * (b22 * b33 - b23 * b23) - b12 * (b12 * b33 - b23 * b13) + b13 * (b12 * b23 - b22 * b13)) / 2;
    const phi = Math.acos(r < -1 ? -1 : r > 1 ? 1 : r) / 3;
    e2 = q + 2 * p * Math.cos(phi);
    e0 = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
    e1 = 3 * q - e0 - e2;
  }
  const scale = Math.max(Math.abs(e2), 1e-300);
  for (let i = 0; i < 3; i++) {
    const lam = i === 0 ? e0 : i === 1 ? e1 : e2;
    // Rows of A − λI and their cross products; keep the largest.
    const r00 = a11 - lam;
    const r11 = a22 - lam;
    const r22 = a33 - lam;
    let vx = a12 * a23 - a13 * r11;
    let vy = a13 * a12 - r00 * a23;
    let vz = r00 * r11 - a12 * a12;
    let n = vx * vx + vy * vy + vz * vz;
    const ux = a12 * r22 - a13 * a23;
    const uy = a13 * a13 - r00 * r22;
    const uz = r00 * a23 - a12 * a13;
    const nu = ux * ux + uy * uy + uz * uz;
    if (nu > n) {
      vx = ux;
      vy = uy;
      vz = uz;
      n = nu;
    }
    const wx = r11 * r22 - a23 * a23;
    const wy = a23 * a13 - a12 * r22;
    const wz = a12 * a23 - r11 * a13;
    if (wx * wx + wy * wy + wz * wz > n) {
      vx = wx;
      vy = wy;
      vz = wz;
    }
    // u = L⁻ᵀ·v
    const u3 = vz / l33;
    const u2 = (vy - l32 * u3) / l22;
    const u1 = vx / l11;
    if (Math.abs(u3) * half > Math.max(Math.abs(u1), Math.abs(u2))) {
      return lam > 1e-9 * scale ? Math.sqrt(lam) / (2 * Math.PI) : 0;
    }
  }
  return e2 > 0 ? Math.sqrt(e2) / (2 * Math.PI) : 0;
}

/**
 * The gantry yaw mode at every grid point from the map's condensed stiffness (x, y, φ) and the gantry's mass
 * data, which depends on where the carriage sits along the gantry.
 * @param args.kNPerM - condensed x/y stiffness per point, flat [iy·nx + ix] [N/m]
 * @param args.yawAt - condensed yaw rows at a grid point [N/rad, N·m/rad]
 * @param args.nx - grid columns
 * @param args.ny - grid rows
 * @param args.massAt - mass data with the carriage in column ix
 * @param args.halfSpanMm - half the distance between the guide lines [mm]
 * @returns yaw frequency per point [iy][ix] [Hz]; 0 where the belts leave yaw unheld
 * @see docs/models/structural-modes.md; {@link yawModeFrequencyHz} is the same computation for one point
 */
export function gantryYawMap(args: {
  kNPerM: { xx: Float64Array; xy: Float64Array; yy: Float64Array };
  yawAt: (ix: number, iy: number) => { xf: number; yf: number; ff: number };
  nx: number;
  ny: number;
  massAt: (ix: number) => YawMass;
  halfSpanMm: number;
  /** Every how many grid points the yaw is solved exactly, interpolated in between (default 1: all). */
  gridStride?: number;
}): number[][] {
  const { kNPerM: k, nx, ny } = args;
  const masses = Array.from({ length: nx }, (_, ix) => args.massAt(ix));
  const half = args.halfSpanMm / 1000;
  const kk = [0, 0, 0, 0, 0, 0];
  const at = (ix: number, iy: number): number => {
    const p = iy * nx + ix;
    kk[0] = k.xx[p];
    kk[1] = k.xy[p];
    kk[2] = k.yy[p];
    const y = args.yawAt(ix, iy);
    kk[3] = y.xf;
    kk[4] = y.yf;
    kk[5] = y.ff;
    const m = masses[ix];
    return yawPointHz(kk, m.xKg, m.yKg, m.couplingKgM, m.yawInertiaKgM2, half);
  };
  return sampledGridMap(nx, ny, Math.max(1, Math.floor(args.gridStride ?? 1)), at, 'min').values;
}
