import { requireNumber } from './errors';

// Radial loads on motor shafts and idler bearings from the belt arms (docs/models/shaft-loads.md).

/**
 * Radial load a wrapped pulley puts on its shaft: the vector sum of the two belt arms' pulls. The arms leave the
 * pulley along tangents whose directions differ by π − θ (θ = wrap angle), so
 * R = √(T₁² + T₂² − 2·T₁·T₂·cos θ); with equal tensions R = 2·T·sin(θ/2).
 * @param args.tension1N - tension of one arm T₁ [N]
 * @param args.tension2N - tension of the other arm T₂ [N]
 * @param args.wrapRad - wrap angle θ [rad]
 * @returns radial load on the shaft [N]
 * @see J. E. Shigley, Mechanical Engineering Design, flexible elements: shaft load of a belt drive (from memory);
 *   docs/models/shaft-loads.md
 */
export function pulleyRadialLoadN(args: { tension1N: number; tension2N: number; wrapRad: number }): number {
  const s = 'pulleyRadialLoadN';
  const t1 = requireNumber(s, 'tension1N', args?.tension1N);
  const t2 = requireNumber(s, 'tension2N', args?.tension2N);
  const w = requireNumber(s, 'wrapRad', args?.wrapRad, 0, 2 * Math.PI);
  // A slack arm pushes nothing: a belt cannot carry compression.
  const a = Math.max(0, t1);
  const b = Math.max(0, t2);
  return Math.sqrt(Math.max(0, a * a + b * b - 2 * a * b * Math.cos(w)));
}

/** One pulley of the layout with the arm tensions the load is computed from. */
export interface PulleyLoadInput {
  id: string;
  /** Plain-words name (as in the span table). */
  label: string;
  kind: 'drive' | 'idler';
  /** Wrap angle [rad]. */
  wrapRad: number;
  /** Tension of each arm at pretension [N]. */
  atPretensionN: [number, number];
  /** Tension of each arm at the worst peak pull [N]. */
  atPeakN: [number, number];
}

/** Load on one pulley's shaft. */
export interface PulleyLoad {
  id: string;
  label: string;
  kind: 'drive' | 'idler';
  wrapDeg: number;
  atPretensionN: number;
  atPeakN: number;
  ratingN: number;
}

/** Loads section of the result (docs/models/shaft-loads.md). */
export interface LoadsResult {
  /** Largest radial load on any motor shaft [N]. */
  motorShaftRadialN: { atPretension: number; atPeak: number };
  /** Largest radial load on any idler [N]. */
  idlerRadialN: { atPretension: number; atPeak: number };
  /** Ratings the loads are compared with [N]. */
  ratingN: { motorShaft: number; idler: number };
  /** Every pulley's load. */
  pulleys: PulleyLoad[];
}

/**
 * Radial load on every drive pulley and idler at pretension and at the worst peak pull, and the largest of each
 * kind, against the ratings the designer gives.
 * @param args.pulleys - pulleys with wrap [rad] and arm tensions [N]
 * @param args.motorShaftRatingN - rated radial load of a motor shaft at the pulley [N]
 * @param args.idlerRatingN - rated radial load of an idler (its bearings) [N]
 * @returns the loads section
 * @see docs/models/shaft-loads.md
 */
export function shaftLoads(args: { pulleys: PulleyLoadInput[]; motorShaftRatingN: number; idlerRatingN: number }): LoadsResult {
  const pulleys: PulleyLoad[] = args.pulleys.map((p) => ({
    id: p.id,
    label: p.label,
    kind: p.kind,
    wrapDeg: (p.wrapRad * 180) / Math.PI,
    atPretensionN: pulleyRadialLoadN({ tension1N: p.atPretensionN[0], tension2N: p.atPretensionN[1], wrapRad: p.wrapRad }),
    atPeakN: pulleyRadialLoadN({ tension1N: p.atPeakN[0], tension2N: p.atPeakN[1], wrapRad: p.wrapRad }),
    ratingN: p.kind === 'drive' ? args.motorShaftRatingN : args.idlerRatingN,
  }));
  const most = (kind: 'drive' | 'idler', key: 'atPretensionN' | 'atPeakN') =>
    pulleys.filter((p) => p.kind === kind).reduce((m, p) => Math.max(m, p[key]), 0);
  return {
    motorShaftRadialN: { atPretension: most('drive', 'atPretensionN'), atPeak: most('drive', 'atPeakN') },
    idlerRadialN: { atPretension: most('idler', 'atPretensionN'), atPeak: most('idler', 'atPeakN') },
    ratingN: { motorShaft: args.motorShaftRatingN, idler: args.idlerRatingN },
    pulleys,
  };
}
