/**
 * Independent solution of a belt chain as springs: node flows s_k (belt the pulley k passes from piece k to
 * piece k+1) stretch piece i by s_i − s_{i−1}; piece i is a spring EA/L_i; each pulley balances
 * T_k − T_{k+1} = F_k. Solved as a linear system by Gaussian elimination (the stiffness method), not by the
 * length-condition formula the engine uses.
 */
export function springChainN(lengthsMm: number[], pullsN: number[], eaN = 40000): number[] {
  const n = lengthsMm.length;
  const m = n - 1;
  const k = lengthsMm.map((l) => eaN / l);
  // ΔT_i = k_i·(s_i − s_{i−1}), s_0 = s_n = 0 (1-based pieces); equation k: ΔT_k − ΔT_{k+1} = F_k.
  const a: number[][] = Array.from({ length: m }, () => new Array<number>(m + 1).fill(0));
  for (let r = 0; r < m; r++) {
    // piece r (0-based) has stretch s_r − s_{r−1}; piece r+1 has s_{r+1} − s_r
    a[r][r] += k[r] + k[r + 1];
    if (r > 0) a[r][r - 1] -= k[r];
    if (r + 1 < m) a[r][r + 1] -= k[r + 1];
    a[r][m] = pullsN[r];
  }
  for (let c = 0; c < m; c++) {
    for (let r = c + 1; r < m; r++) {
      const f = a[r][c] / a[c][c];
      for (let j = c; j <= m; j++) a[r][j] -= f * a[c][j];
    }
  }
  const s = new Array<number>(m).fill(0);
  for (let r = m - 1; r >= 0; r--) {
    let v = a[r][m];
    for (let j = r + 1; j < m; j++) v -= a[r][j] * s[j];
    s[r] = v / a[r][r];
  }
  return lengthsMm.map((_, i) => k[i] * ((i < m ? s[i] : 0) - (i > 0 ? s[i - 1] : 0)));
}
