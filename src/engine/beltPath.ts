/** One element a belt passes: a pulley (radius > 0) or a clamp point (radius 0), in plan coordinates. */
export interface PathElement {
  /** Element id, for naming spans. */
  id: string;
  /** Centre X [mm]. */
  xMm: number;
  /** Centre Y [mm]. */
  yMm: number;
  /** Pitch radius [mm]; 0 for a clamp point. */
  radiusMm: number;
  /** Direction the belt goes round the pulley: +1 counter-clockwise (pulley on the belt's left), −1 clockwise. */
  sense: 1 | -1;
}

/** A straight free span between two elements, from tangent point to tangent point. */
export interface PathSpan {
  /** Id of the element the span leaves. */
  from: string;
  /** Id of the element the span reaches. */
  to: string;
  /** Start point [mm]. */
  x1Mm: number;
  y1Mm: number;
  /** End point [mm]. */
  x2Mm: number;
  y2Mm: number;
  /** Span length [mm]. */
  lengthMm: number;
}

/** The belt's contact with one interior element. */
export interface PathWrap {
  /** Element id. */
  id: string;
  /** Wrap angle [rad]. */
  wrapRad: number;
  /** Belt length in contact (pitch line) [mm]. */
  arcMm: number;
}

/** A solved belt path. */
export interface SolvedPath {
  /** Spans in path order (n − 1 for n elements). */
  spans: PathSpan[];
  /** Wraps of the interior elements in path order (n − 2). */
  wraps: PathWrap[];
  /** Total pitch-line length, spans plus arcs [mm]. */
  lengthMm: number;
  /** False when two consecutive elements overlap so that no tangent exists (geometry invalid). */
  valid: boolean;
}

const TWO_PI = 2 * Math.PI;

function wrapAngle(a: number): number {
  let r = a % TWO_PI;
  if (r < 0) r += TWO_PI;
  return r;
}

/**
 * Solves an open belt path through pulleys and clamp points: the straight span between two consecutive circles
 * is their common tangent on the sides the belt's sense of wrap demands, so spans and wrap angles follow from
 * pulley centres alone. With signed radii ρ = sense·r and the span's left normal n, the tangent points are
 * P = C − ρ·n and (C₂ − C₁)·n = ρ₂ − ρ₁, which fixes n uniquely for a span running from the first to the second.
 * @param elements - path elements in belt order; the first and last are usually clamp points
 * @returns spans, wraps of interior elements and total length [mm, rad]
 * @see classical belt-drive geometry (Shigley's Mechanical Engineering Design, ch. 17, for the two-pulley case)
 */
export function solveBeltPath(elements: readonly PathElement[]): SolvedPath {
  const spans: PathSpan[] = [];
  const wraps: PathWrap[] = [];
  let valid = true;
  let total = 0;
  // Tangent points where each span starts (out) and ends (in), to get the wraps afterwards.
  const outPts: [number, number][] = [];
  const inPts: [number, number][] = [];
  for (let i = 0; i + 1 < elements.length; i++) {
    const a = elements[i];
    const b = elements[i + 1];
    const ra = a.sense * a.radiusMm;
    const rb = b.sense * b.radiusMm;
    const dx = b.xMm - a.xMm;
    const dy = b.yMm - a.yMm;
    const d = Math.hypot(dx, dy);
    const c = d > 0 ? (rb - ra) / d : 2;
    if (!(Math.abs(c) <= 1)) valid = false;
    const alpha = Math.atan2(dy, dx) + Math.acos(Math.max(-1, Math.min(1, c)));
    const nx = Math.cos(alpha);
    const ny = Math.sin(alpha);
    const p1: [number, number] = [a.xMm - ra * nx, a.yMm - ra * ny];
    const p2: [number, number] = [b.xMm - rb * nx, b.yMm - rb * ny];
    const len = Math.sqrt(Math.max(0, d * d - (rb - ra) * (rb - ra)));
    spans.push({ from: a.id, to: b.id, x1Mm: p1[0], y1Mm: p1[1], x2Mm: p2[0], y2Mm: p2[1], lengthMm: len });
    outPts[i] = p1;
    inPts[i + 1] = p2;
    total += len;
  }
  for (let i = 1; i + 1 < elements.length; i++) {
    const e = elements[i];
    if (e.radiusMm === 0) {
      wraps.push({ id: e.id, wrapRad: 0, arcMm: 0 });
      continue;
    }
    const aIn = Math.atan2(inPts[i][1] - e.yMm, inPts[i][0] - e.xMm);
    const aOut = Math.atan2(outPts[i][1] - e.yMm, outPts[i][0] - e.xMm);
    const w = e.sense > 0 ? wrapAngle(aOut - aIn) : wrapAngle(aIn - aOut);
    const arc = w * e.radiusMm;
    wraps.push({ id: e.id, wrapRad: w, arcMm: arc });
    total += arc;
  }
  return { spans, wraps, lengthMm: total, valid };
}
