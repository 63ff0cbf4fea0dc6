/**
 * A second, differently built computation for the beam tests: a finite-element model of a simply supported
 * Euler–Bernoulli beam (cubic Hermite elements, consistent mass matrix) with a point mass at a node, whose lowest
 * eigenvalue is found by inverse iteration with a dense Gaussian solver. It shares nothing with the engine's
 * Rayleigh estimate except the physics.
 */

function solve(a: number[][], b: number[]): number[] {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    [m[c], m[p]] = [m[p], m[c]];
    for (let r = c + 1; r < n; r++) {
      const f = m[r][c] / m[c][c];
      for (let k = c; k <= n; k++) m[r][k] -= f * m[c][k];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = m[r][n];
    for (let k = r + 1; k < n; k++) s -= m[r][k] * x[k];
    x[r] = s / m[r][r];
  }
  return x;
}

/**
 * Lowest bending frequency of a simply supported beam with a point mass.
 * @param spanM - span [m]
 * @param ei - bending stiffness E·I [N·m²]
 * @param beamKg - beam mass [kg]
 * @param pointKg - point mass [kg]
 * @param position - point mass position as a share of the span (must fall on a node: k/elements)
 * @param elements - number of elements
 * @returns frequency [Hz]
 */
export function feBeamFrequencyHz(spanM: number, ei: number, beamKg: number, pointKg: number, position: number, elements = 40): number {
  const ne = elements;
  const h = spanM / ne;
  const mu = beamKg / spanM;
  const nd = 2 * (ne + 1);
  const K = Array.from({ length: nd }, () => new Array<number>(nd).fill(0));
  const M = Array.from({ length: nd }, () => new Array<number>(nd).fill(0));
  const ke = [
    [12, 6 * h, -12, 6 * h],
    [6 * h, 4 * h * h, -6 * h, 2 * h * h],
    [-12, -6 * h, 12, -6 * h],
    [6 * h, 2 * h * h, -6 * h, 4 * h * h],
  ].map((r) => r.map((v) => (v * ei) / h ** 3));
  const me = [
    [156, 22 * h, 54, -13 * h],
    [22 * h, 4 * h * h, 13 * h, -3 * h * h],
    [54, 13 * h, 156, -22 * h],
    [-13 * h, -3 * h * h, -22 * h, 4 * h * h],
  ].map((r) => r.map((v) => (v * mu * h) / 420));
  for (let e = 0; e < ne; e++) {
    const dofs = [2 * e, 2 * e + 1, 2 * e + 2, 2 * e + 3];
    for (let i = 0; i < 4; i++)
      for (let j = 0; j < 4; j++) {
        K[dofs[i]][dofs[j]] += ke[i][j];
        M[dofs[i]][dofs[j]] += me[i][j];
      }
  }
  const node = Math.round(position * ne);
  M[2 * node][2 * node] += pointKg;
  // Simple supports: no deflection at the two end nodes.
  const keep = [...Array(nd).keys()].filter((d) => d !== 0 && d !== 2 * ne);
  const k = keep.map((i) => keep.map((j) => K[i][j]));
  const m = keep.map((i) => keep.map((j) => M[i][j]));
  let x = keep.map((_, i) => Math.sin((Math.PI * (i + 1)) / keep.length) + 1);
  let lambda = 0;
  for (let it = 0; it < 200; it++) {
    const mx = m.map((row) => row.reduce((s, v, j) => s + v * x[j], 0));
    const y = solve(k, mx);
    const ky = k.map((row) => row.reduce((s, v, j) => s + v * y[j], 0));
    const my = m.map((row) => row.reduce((s, v, j) => s + v * y[j], 0));
    const next = y.reduce((s, v, i) => s + v * ky[i], 0) / y.reduce((s, v, i) => s + v * my[i], 0);
    const norm = Math.sqrt(y.reduce((s, v) => s + v * v, 0));
    x = y.map((v) => v / norm);
    if (Math.abs(next - lambda) < 1e-12 * next) {
      lambda = next;
      break;
    }
    lambda = next;
  }
  return Math.sqrt(lambda) / (2 * Math.PI);
}
