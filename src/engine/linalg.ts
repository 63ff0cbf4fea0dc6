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
