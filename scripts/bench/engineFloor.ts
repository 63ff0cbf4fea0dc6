/**
 * The floor the engine figure is compared with: a plain loop doing the arithmetic of one evaluation's two big
 * parts on typed arrays, with nothing else (no schema, no belt layout, no result objects):
 * - the stiffness map: at each of points × points carriage positions, a spring EA/L per belt piece, the 15 products
 *   per group of pieces, the condensation of three motor coordinates and the lowest eigenvalue of the 2 × 2
 *   carriage stiffness with the X and Y masses (src/engine/stiffness.ts does this per point);
 * - the envelope: in each of 360 directions, the 2 × 2 split of a carriage force into motor pulls and a bisection
 *   of the top speed on a piecewise-linear torque curve (src/engine/envelope.ts).
 * Same sizes as the engine's run: the ratio engine ÷ floor says how much the engine spends beyond the arithmetic.
 */

const PIECES = 12;
const GROUPS = 3;
const CURVE = 32;

/** Inputs shaped like a crossed-belt stage, made once. */
export function floorInputs(): { l0: Float64Array; gx: Float64Array; gy: Float64Array; coef: Float64Array; curve: Float64Array } {
  const l0 = new Float64Array(PIECES);
  const gx = new Float64Array(PIECES);
  const gy = new Float64Array(PIECES);
  for (let r = 0; r < PIECES; r++) {
    l0[r] = 80 + 17 * r;
    gx[r] = r % 3 === 0 ? 1 : r % 3 === 1 ? -1 : 0;
    gy[r] = r % 4 === 0 ? 0.5 : r % 4 === 1 ? -1 : 0;
  }
  const coef = new Float64Array(GROUPS * 15);
  for (let g = 0; g < GROUPS; g++) for (let c = 0; c < 15; c++) coef[g * 15 + c] = ((g + 1) * (c + 2)) % 7 === 0 ? -1 : 1;
  const curve = new Float64Array(CURVE);
  for (let i = 0; i < CURVE; i++) curve[i] = 0.45 / (1 + (i / 8) ** 2);
  return { l0, gx, gy, coef, curve };
}

function torqueAt(curve: Float64Array, revPerS: number): number {
  const pos = Math.min(CURVE - 1.000001, Math.max(0, revPerS / 2));
  const i = Math.floor(pos);
  return curve[i] + (curve[i + 1] - curve[i]) * (pos - i);
}

/**
 * One floor run.
 * @param points - grid points per side (101 for the figure)
 * @returns a checksum, so the work cannot be optimised away
 */
export function floorRun(inp: ReturnType<typeof floorInputs>, points: number): number {
  const { l0, gx, gy, coef, curve } = inp;
  const ea = 60000 * 1000;
  const kg = new Float64Array(GROUPS);
  let checksum = 0;
  for (let iy = 0; iy < points; iy++) {
    const cy = 20 + (300 * iy) / (points - 1);
    for (let ix = 0; ix < points; ix++) {
      const cx = 20 + (300 * ix) / (points - 1);
      kg.fill(0);
      for (let r = 0; r < PIECES; r++) {
        const len = l0[r] + gx[r] * cx + gy[r] * cy;
        kg[r % GROUPS] += ea / (len > 1e-3 ? len : 1e-3);
      }
      let kxx = 0,
        kxy = 0,
        x0 = 0,
        x1 = 0,
        x2 = 0,
        kyy = 0,
        y0 = 0,
        y1 = 0,
        y2 = 0,
        h00 = 2e5,
        h01 = 0,
        h02 = 0,
        h11 = 2e5,
        h12 = 0,
        h22 = 1;
      for (let g = 0; g < GROUPS; g++) {
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
        h00 += k * Math.abs(coef[o + 9]);
        h01 += k * coef[o + 10] * 0.1;
        h02 += k * coef[o + 11] * 0.1;
        h11 += k * Math.abs(coef[o + 12]);
        h12 += k * coef[o + 13] * 0.1;
        h22 += k * Math.abs(coef[o + 14]);
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
      const cxx = Math.abs(kxx - (x0 * x0) / h00 - (x1b * x1b) / d1 - (x2b * x2b) / d2);
      const cxy = kxy - (x0 * y0) / h00 - (x1b * y1b) / d1 - (x2b * y2b) / d2;
      const cyy = Math.abs(kyy - (y0 * y0) / h00 - (y1b * y1b) / d1 - (y2b * y2b) / d2);
      // Lowest eigenvalue of M^-1/2 K M^-1/2 for masses 1.2 kg (X) and 2.1 kg (Y).
      const a = cxx / 1.2;
      const b = cxy / Math.sqrt(1.2 * 2.1);
      const c = cyy / 2.1;
      const lam = (a + c) / 2 - Math.sqrt(((a - c) / 2) ** 2 + b * b);
      checksum += Math.sqrt(lam > 0 ? lam : 0) / (2 * Math.PI);
    }
  }
  // Envelope: 360 directions, force split through K⁻ᵀ and a top-speed bisection on the torque curve.
  const radius = 0.0064;
  for (let d = 0; d < 360; d++) {
    const th = (d * Math.PI) / 180;
    const ux = Math.cos(th);
    const uy = Math.sin(th);
    const pa = Math.abs(0.5 * (ux + uy));
    const pb = Math.abs(0.5 * (ux - uy));
    const share = Math.max(pa, pb, 1e-9);
    let lo = 0;
    let hi = 60;
    for (let it = 0; it < 40; it++) {
      const mid = (lo + hi) / 2;
      const rev = (mid * share) / (2 * Math.PI * radius);
      if (torqueAt(curve, rev) / radius > 5 * share) lo = mid;
      else hi = mid;
    }
    const accel = (torqueAt(curve, 0) / radius / share - 2) / 3.3;
    checksum += lo + accel;
  }
  return checksum;
}
