import { requireNumber } from './errors';

// Derivation: docs/models/belt-tension.md §2–3.

/**
 * Tight and slack arm of a belt loop with one drive pulley, clamped at both ends to the carriage. Belt-length
 * conservation (Σ ΔTᵢ·Lᵢ/EA = 0, the loop keeps its length) and the pulley's balance (ΔT₁ − ΔT₂ = F) split the
 * pull: ΔT₁ = F·L₂/L on the arm the motor pulls, ΔT₂ = −F·L₁/L on the other, L = L₁ + L₂. The short arm takes
 * almost all of the change.
 * @param args.pretensionN - tension of the whole loop with no pull T₀ [N]
 * @param args.pullN - pull the motor puts into the belt F [N] (its size is used)
 * @param args.pullArmMm - length of the arm the motor pulls, L₁ [mm]
 * @param args.otherArmMm - length of the other arm, L₂ [mm]
 * @returns tight-side and slack-side tension [N]
 * @see docs/models/belt-tension.md §2
 */
export function beltArmTensionsN(args: { pretensionN: number; pullN: number; pullArmMm: number; otherArmMm: number }): {
  tightN: number;
  slackN: number;
} {
  const s = 'beltArmTensionsN';
  const t0 = requireNumber(s, 'pretensionN', args?.pretensionN, 0);
  const f = Math.abs(requireNumber(s, 'pullN', args?.pullN));
  const l1 = requireNumber(s, 'pullArmMm', args?.pullArmMm, 0);
  const l2 = requireNumber(s, 'otherArmMm', args?.otherArmMm, 0);
  const l = requireNumber(s, 'pullArmMm + otherArmMm', l1 + l2, 0, Infinity, true);
  return { tightN: t0 + (f * l2) / l, slackN: t0 - (f * l1) / l };
}

/**
 * Tension change of every piece of a belt chain clamped at both ends, for pulls at its drive pulleys. Piece i
 * runs from node i−1 to node i; the drive pulley between piece k and k+1 pulls belt out of piece k into piece k+1
 * with F_k = T_k − T_{k+1}. With the length condition Σ ΔTᵢ·Lᵢ = 0 this fixes every piece: ΔTᵢ = u − Sᵢ,
 * Sᵢ = Σ_{k<i} F_k, u = Σ Lᵢ·Sᵢ / Σ Lᵢ. One pulley gives {@link beltArmTensionsN}; the H loop has two.
 * @param lengthsMm - piece lengths in belt order [mm] (n pieces)
 * @param nodePullsN - pull of each drive pulley between consecutive pieces [N] (n − 1 values)
 * @returns tension change of each piece [N]
 * @see docs/models/belt-tension.md §3
 */
export function chainTensionChangesN(lengthsMm: readonly number[], nodePullsN: readonly number[]): number[] {
  const n = lengthsMm.length;
  const s = new Array<number>(n).fill(0);
  for (let i = 1; i < n; i++) s[i] = s[i - 1] + nodePullsN[i - 1];
  let total = 0;
  let weighted = 0;
  for (let i = 0; i < n; i++) {
    total += lengthsMm[i];
    weighted += lengthsMm[i] * s[i];
  }
  const u = weighted / total;
  return s.map((si) => u - si);
}
