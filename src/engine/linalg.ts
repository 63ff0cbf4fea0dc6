/** A 2×2 matrix as rows: [[a, b], [c, d]]. */
export type Matrix2 = [[number, number], [number, number]];

/**
 * Determinant of a 2×2 matrix.
 * @param m - matrix
 * @returns ad − bc
 */
export function det2(m: Matrix2): number {
  return m[0][0] * m[1][1] - m[0][1] * m[1][0];
}

/**
 * Inverse of a 2×2 matrix (the caller guarantees it is regular: every mechanism's K is).
 * @param m - matrix
 * @returns m⁻¹
 */
export function inverse2(m: Matrix2): Matrix2 {
  const d = det2(m);
  return [
    [m[1][1] / d, -m[0][1] / d],
    [-m[1][0] / d, m[0][0] / d],
  ];
}

/**
 * Transpose of a 2×2 matrix.
 * @param m - matrix
 * @returns mᵀ
 */
export function transpose2(m: Matrix2): Matrix2 {
  return [
    [m[0][0], m[1][0]],
    [m[0][1], m[1][1]],
  ];
}

/**
 * Product of two 2×2 matrices.
 * @param a - left factor
 * @param b - right factor
 * @returns a·b
 */
export function multiply2(a: Matrix2, b: Matrix2): Matrix2 {
  return [
    [a[0][0] * b[0][0] + a[0][1] * b[1][0], a[0][0] * b[0][1] + a[0][1] * b[1][1]],
    [a[1][0] * b[0][0] + a[1][1] * b[1][0], a[1][0] * b[0][1] + a[1][1] * b[1][1]],
  ];
}

/**
 * Matrix times column vector.
 * @param m - matrix
 * @param x - first component
 * @param y - second component
 * @returns m·[x, y]ᵀ
 */
export function apply2(m: Matrix2, x: number, y: number): [number, number] {
  return [m[0][0] * x + m[0][1] * y, m[1][0] * x + m[1][1] * y];
}

/**
 * Smallest eigenvalue of the generalised symmetric problem K·v = λ·M·v with M diagonal and positive.
 * Scaling by M^(-1/2) gives the symmetric matrix [[k11/m1, k12/√(m1m2)], [k12/√(m1m2), k22/m2]] whose
 * smaller eigenvalue has a closed form, which keeps the stiffness map free of iterative solvers.
 * @param k11 - stiffness term xx [N/m]
 * @param k12 - stiffness term xy [N/m]
 * @param k22 - stiffness term yy [N/m]
 * @param m1 - mass along the first coordinate [kg]
 * @param m2 - mass along the second coordinate [kg]
 * @returns smallest λ = ω² [1/s²]
 * @see S. S. Rao, Mechanical Vibrations, 5th ed., ch. 5, two-degree-of-freedom systems (from memory)
 */
export function lowestEigenvalue2(k11: number, k12: number, k22: number, m1: number, m2: number): number {
  const a = k11 / m1;
  const d = k22 / m2;
  const b = k12 / Math.sqrt(m1 * m2);
  const half = (a + d) / 2;
  const r = Math.sqrt(((a - d) / 2) * ((a - d) / 2) + b * b);
  return half - r;
}

/** A symmetric 3×3 matrix by its six distinct entries. */
export interface Sym3 {
  xx: number;
  xy: number;
  xz: number;
  yy: number;
  yz: number;
  zz: number;
}

/** Eigenvalues (ascending) and the matching eigenvectors of a generalised symmetric 3×3 problem. */
export interface Eigen3 {
  values: [number, number, number];
  vectors: [[number, number, number], [number, number, number], [number, number, number]];
}

function cross3(a: number[], b: number[]): [number, number, number] {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/**
 * Solves K·u = λ·M·u for symmetric K and symmetric positive definite M (3 × 3). M = L·Lᵀ (Cholesky) turns it into
 * the ordinary symmetric problem A = L⁻¹·K·L⁻ᵀ, whose eigenvalues have a closed form (trigonometric solution of the
 * characteristic cubic); each eigenvector is the largest cross product of two rows of A − λI, mapped back by L⁻ᵀ.
 * Closed form on purpose: the stiffness map calls it at every grid point.
 * @param k - stiffness matrix
 * @param m - mass matrix (positive definite)
 * @returns eigenvalues ascending [1/s² when K in N/m and M in kg] and eigenvectors u (not normalised)
 * @see O. K. Smith, "Eigenvalues of a symmetric 3 × 3 matrix", Communications of the ACM 4(4), 1961, p. 168
 */
export function generalizedEigen3(k: Sym3, m: Sym3): Eigen3 {
  // Cholesky M = L·Lᵀ, L lower triangular.
  const l11 = Math.sqrt(m.xx);
  const l21 = m.xy / l11;
  const l31 = m.xz / l11;
  const l22 = Math.sqrt(m.yy - l21 * l21);
  const l32 = (m.yz - l31 * l21) / l22;
  const l33 = Math.sqrt(m.zz - l31 * l31 - l32 * l32);
  // Columns of L⁻¹ applied to K: B = L⁻¹·K (forward substitution on each column), then A = B·L⁻ᵀ.
  const kk = [
    [k.xx, k.xy, k.xz],
    [k.xy, k.yy, k.yz],
    [k.xz, k.yz, k.zz],
  ];
  const fwd = (c: number[]): number[] => {
    const y1 = c[0] / l11;
    const y2 = (c[1] - l21 * y1) / l22;
    const y3 = (c[2] - l31 * y1 - l32 * y2) / l33;
    return [y1, y2, y3];
  };
  const bCols = [0, 1, 2].map((j) => fwd([kk[0][j], kk[1][j], kk[2][j]]));
  // A = L⁻¹·(L⁻¹·K)ᵀ since K is symmetric: row i of A = L⁻¹ applied to row i of B.
  const bRows = [0, 1, 2].map((i) => [bCols[0][i], bCols[1][i], bCols[2][i]]);
  const aRows = bRows.map(fwd);
  const a11 = aRows[0][0];
  const a22 = aRows[1][1];
  const a33 = aRows[2][2];
  const a12 = (aRows[0][1] + aRows[1][0]) / 2;
  const a13 = (aRows[0][2] + aRows[2][0]) / 2;
  const a23 = (aRows[1][2] + aRows[2][1]) / 2;
  const p1 = a12 * a12 + a13 * a13 + a23 * a23;
  let e: [number, number, number];
  if (p1 <= 1e-30 * (a11 * a11 + a22 * a22 + a33 * a33)) {
    // Already diagonal: the eigenvectors are the unit vectors, mapped back by L⁻ᵀ.
    const order = [0, 1, 2].sort((i, j) => [a11, a22, a33][i] - [a11, a22, a33][j]);
    const back = (v: number[]): [number, number, number] => {
      const u3 = v[2] / l33;
      const u2 = (v[1] - l32 * u3) / l22;
      return [(v[0] - l21 * u2 - l31 * u3) / l11, u2, u3];
    };
    return {
      values: order.map((i) => [a11, a22, a33][i]) as [number, number, number],
      vectors: order.map((i) => back([i === 0 ? 1 : 0, i === 1 ? 1 : 0, i === 2 ? 1 : 0])) as Eigen3['vectors'],
    };
  } else {
    const q = (a11 + a22 + a33) / 3;
    const p2 = (a11 - q) ** 2 + (a22 - q) ** 2 + (a33 - q) ** 2 + 2 * p1;
    const p = Math.sqrt(p2 / 6);
    const b11 = (a11 - q) / p;
    const b22 = (a22 - q) / p;
    const b33 = (a33 - q) / p;
    const b12 = a12 / p;
    const b13 = a13 / p;
    const b23 = a23 / p;
    const r = (b11 * (b22 * b33 - b23 * b23) - b12 * (b12 * b33 - b23 * b13) + b13 * (b12 * b23 - b22 * b13)) / 2;
    const phi = Math.acos(Math.max(-1, Math.min(1, r))) / 3;
    const hi = q + 2 * p * Math.cos(phi);
    const lo = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
    e = [lo, 3 * q - hi - lo, hi];
  }
  const a = [
    [a11, a12, a13],
    [a12, a22, a23],
    [a13, a23, a33],
  ];
  const vectors = e.map((lam) => {
    const r0 = [a[0][0] - lam, a[0][1], a[0][2]];
    const r1 = [a[1][0], a[1][1] - lam, a[1][2]];
    const r2 = [a[2][0], a[2][1], a[2][2] - lam];
    const c = [cross3(r0, r1), cross3(r0, r2), cross3(r1, r2)];
    const n = c.map((v) => v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);
    let v: number[] = c[n.indexOf(Math.max(...n))];
    if (Math.max(...n) <= 1e-30) {
      // A repeated eigenvalue leaves A − λI of rank one: any vector normal to its largest row will do.
      const rows = [r0, r1, r2];
      const rn = rows.map((x) => x[0] * x[0] + x[1] * x[1] + x[2] * x[2]);
      const big = rows[rn.indexOf(Math.max(...rn))];
      const axis = [0, 1, 2].reduce((best, i) => (Math.abs(big[i]) < Math.abs(big[best]) ? i : best), 0);
      v = rn.every((x) => x === 0) ? [1, 0, 0] : cross3(big, [axis === 0 ? 1 : 0, axis === 1 ? 1 : 0, axis === 2 ? 1 : 0]);
    }
    // u = L⁻ᵀ·v (back substitution with Lᵀ).
    const u3 = v[2] / l33;
    const u2 = (v[1] - l32 * u3) / l22;
    const u1 = (v[0] - l21 * u2 - l31 * u3) / l11;
    return [u1, u2, u3] as [number, number, number];
  }) as Eigen3['vectors'];
  return { values: e, vectors };
}
