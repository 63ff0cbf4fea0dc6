import { motorForcesN, type DesignResult, type EnvelopeInput } from '@/engine';

/**
 * Pure helpers that turn an engine result into the series the Design desk plots. The numbers all come from the
 * engine; these only pick, split and convert them.
 */

/** A signed per-direction series split into its positive and negative parts (null elsewhere), as magnitudes. */
export interface SplitSeries {
  positive: (number | null)[];
  negative: (number | null)[];
}

/**
 * Splits a signed series so a polar plot (radius ≥ 0) can draw "turns +" and "turns −" with different dashes.
 * Points where the sign changes are kept in both parts so the curves meet.
 * @param values - signed values per direction
 */
export function splitBySign(values: number[]): SplitSeries {
  const eps = 1e-9;
  const positive: (number | null)[] = [];
  const negative: (number | null)[] = [];
  values.forEach((v, i) => {
    const prev = values[(i - 1 + values.length) % values.length];
    const next = values[(i + 1) % values.length];
    const isPos = v > eps;
    const isNeg = v < -eps;
    const nearZero = !isPos && !isNeg;
    positive.push(isPos || nearZero || prev > eps || next > eps ? Math.abs(v) : null);
    negative.push(isNeg || nearZero || prev < -eps || next < -eps ? Math.abs(v) : null);
  });
  return { positive, negative };
}

/**
 * Belt pull each motor must give to reach the acceleration limit at rest in every direction, with friction and
 * the motor's own equivalent mass (the engine's motorForcesN on the engine's masses).
 * @param result - engine result
 * @param friction - guide friction along X and Y [N]
 * @returns absolute pull per direction for motors A and B [N]
 */
export function pullsAtLimit(result: DesignResult, friction: { x: number; y: number }): { a: number[]; b: number[] } {
  // motorForcesN reads only the matrix, masses and friction of its envelope input.
  const input = {
    k: result.kinematics.matrix,
    xKg: result.mass.xKg,
    yKg: result.mass.yKg,
    motorEquivalentKg: [result.mass.motorEquivalentKg.a, result.mass.motorEquivalentKg.b],
    frictionXN: Number.isFinite(friction.x) ? friction.x : 0,
    frictionYN: Number.isFinite(friction.y) ? friction.y : 0,
  } as unknown as EnvelopeInput;
  const a: number[] = [];
  const b: number[] = [];
  result.envelope.directionsDeg.forEach((deg, i) => {
    const [fa, fb] = motorForcesN(input, (deg * Math.PI) / 180, result.envelope.accelMaxMPerS2[i]);
    a.push(Math.abs(fa));
    b.push(Math.abs(fb));
  });
  return { a, b };
}

/**
 * Direction ranges in which each motor limits, e.g. "A: 0–44°, 136–224° · B: …".
 * @param limiting - limiting motor per direction (index = degree)
 * @returns ranges per motor as [from, to] degrees
 */
export function limitingRanges(limiting: ('A' | 'B')[]): Record<'A' | 'B', [number, number][]> {
  const out: Record<'A' | 'B', [number, number][]> = { A: [], B: [] };
  let start = 0;
  for (let i = 1; i <= limiting.length; i++) {
    if (i === limiting.length || limiting[i] !== limiting[start]) {
      out[limiting[start]].push([start, i - 1]);
      start = i;
    }
  }
  return out;
}

/**
 * Converts every entry of a series (null stays null).
 * @param values - series
 * @param factor - multiplication factor
 */
export function scaled(values: (number | null)[], factor: number): (number | null)[] {
  return values.map((v) => (v === null ? null : v * factor));
}

/** Closes a polar curve by repeating its first point. */
export function closed<T>(values: T[]): T[] {
  return values.length ? [...values, values[0]] : values;
}
