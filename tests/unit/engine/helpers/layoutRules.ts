/**
 * An independent check that a belt layout can be built as drawn. It reads only the drawing (pulley centres, radii,
 * levels, stacks, span end points, carriage) and tests plain plane geometry written here, not the engine's solver:
 * - every drawn span is a true tangent of the two pulleys it joins (so the drawing is the belt path);
 * - on one level, no two pulleys' flanges overlap; on different levels, two pulleys are either on one bolt
 *   (declared stacked, both idlers) or each one's bolt clears the other's flange;
 * - no span passes through a pulley of its level, through any other pulley's bolt, or through the carriage;
 * - the carriage does not overlap any pulley's flange;
 * - two spans on one level never cross or touch: belts only cross where they are on different levels;
 * - an upright loop (pulley axes horizontal) is checked in its own plane, and its pulleys in plan as thin boxes.
 * Geometry of docs/models/belt-layout.md; the shaft radius and flange allowance are the documented ones.
 */
import type { LayoutDrawing, LayoutPart } from '@/engine';

/** Bolt or shaft radius the rules keep clear of [mm] (a 5 mm shaft; docs/models/belt-layout.md). */
export const SHAFT_MM = 2.5;

type Pt = { x: number; y: number };
type Seg = { a: Pt; b: Pt };

const sub = (p: Pt, q: Pt): Pt => ({ x: p.x - q.x, y: p.y - q.y });
const dot = (p: Pt, q: Pt) => p.x * q.x + p.y * q.y;
const cross = (p: Pt, q: Pt) => p.x * q.y - p.y * q.x;
const len = (p: Pt) => Math.hypot(p.x, p.y);

/** Distance from a point to a segment. */
export function pointSegment(p: Pt, s: Seg): number {
  const d = sub(s.b, s.a);
  const l2 = dot(d, d);
  const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, dot(sub(p, s.a), d) / l2));
  return len(sub(p, { x: s.a.x + t * d.x, y: s.a.y + t * d.y }));
}

/** True when two segments intersect (touching counts). */
function intersects(s: Seg, u: Seg): boolean {
  const d1 = cross(sub(s.b, s.a), sub(u.a, s.a));
  const d2 = cross(sub(s.b, s.a), sub(u.b, s.a));
  const d3 = cross(sub(u.b, u.a), sub(s.a, u.a));
  const d4 = cross(sub(u.b, u.a), sub(s.b, u.a));
  return d1 * d2 < 0 && d3 * d4 < 0;
}

/** Distance between two segments. */
export function segmentSegment(s: Seg, u: Seg): number {
  if (intersects(s, u)) return 0;
  return Math.min(pointSegment(s.a, u), pointSegment(s.b, u), pointSegment(u.a, s), pointSegment(u.b, s));
}

type Rect = { x0: number; y0: number; x1: number; y1: number };

/** Distance from a point to a filled rectangle (0 inside). */
function pointRect(p: Pt, r: Rect): number {
  const dx = Math.max(r.x0 - p.x, 0, p.x - r.x1);
  const dy = Math.max(r.y0 - p.y, 0, p.y - r.y1);
  return Math.hypot(dx, dy);
}

/** True when a segment enters the open interior of a rectangle. */
function segmentEntersRect(s: Seg, r: Rect): boolean {
  // Clip the segment's parameter range to the rectangle (Liang–Barsky); an inside stretch of positive length enters.
  let t0 = 0;
  let t1 = 1;
  const d = sub(s.b, s.a);
  const edges: [number, number][] = [
    [-d.x, s.a.x - r.x0],
    [d.x, r.x1 - s.a.x],
    [-d.y, s.a.y - r.y0],
    [d.y, r.y1 - s.a.y],
  ];
  for (const [p, q] of edges) {
    if (p === 0) {
      if (q <= 0) return false;
    } else {
      const t = q / p;
      if (p < 0) t0 = Math.max(t0, t);
      else t1 = Math.min(t1, t);
    }
  }
  return t1 - t0 > 1e-9;
}

const rectsOverlap = (a: Rect, b: Rect) => a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;

const EPS = 1e-6;

/**
 * All violations of the buildability rules in one drawing (empty when it can be built as drawn).
 * @param dr - layout drawing (engine result or layoutDrawingAt)
 * @param pitchMm - belt pitch [mm]
 * @returns human-readable violations
 */
export function layoutViolations(dr: LayoutDrawing, pitchMm: number): string[] {
  const out: string[] = [];
  const m = dr.flangeMm ?? NaN;
  const w = dr.beltWidthMm ?? NaN;
  if (!(m > 0) || !(w > 0)) return ['drawing lacks flange allowance or belt width'];
  const name = (p: LayoutPart) => p.tag || p.id;
  const pulleys = dr.parts.filter((p) => p.kind !== 'clamp');
  const flat = pulleys.filter((p) => p.axis === 'vertical');
  const upright = pulleys.filter((p) => p.axis !== 'vertical');
  const c: Rect = {
    x0: dr.carriage.xMm - dr.carriage.widthMm / 2,
    x1: dr.carriage.xMm + dr.carriage.widthMm / 2,
    y0: dr.carriage.yMm - dr.carriage.depthMm / 2,
    y1: dr.carriage.yMm + dr.carriage.depthMm / 2,
  };
  const at = (p: LayoutPart): Pt => ({ x: p.xMm, y: p.yMm });

  // Spans with the parts at their ends, per belt in drawing order.
  type Span = Seg & { belt: string; level: number; from: LayoutPart; to: LayoutPart; flat: boolean };
  const spans: Span[] = [];
  for (const belt of dr.belts) {
    const parts = dr.parts.filter((p) => p.belt === belt.id);
    if (parts.length !== belt.segments.length + 1) out.push(`belt ${belt.id}: ${parts.length} parts for ${belt.segments.length} spans`);
    belt.segments.forEach((s, i) => {
      spans.push({
        a: { x: s.x1Mm, y: s.y1Mm },
        b: { x: s.x2Mm, y: s.y2Mm },
        belt: belt.id,
        level: belt.level ?? 0,
        from: parts[i],
        to: parts[i + 1],
        flat: belt.plane === 'flat',
      });
    });
    // Tangency: in plan for a flat loop, in the loop's own plane for an upright one.
    const ends = (p: LayoutPart): Pt =>
      belt.plane === 'flat' ? at(p) : { x: belt.elevation!.along === 'y' ? p.yMm : p.xMm, y: p.zMm ?? NaN };
    const segs =
      belt.plane === 'flat'
        ? belt.segments.map((s) => ({ a: { x: s.x1Mm, y: s.y1Mm }, b: { x: s.x2Mm, y: s.y2Mm } }))
        : (belt.elevation?.segments ?? []).map((s) => ({ a: { x: s.u1Mm, y: s.z1Mm }, b: { x: s.u2Mm, y: s.z2Mm } }));
    segs.forEach((s, i) => {
      const dir = sub(s.b, s.a);
      for (const [p, q] of [
        [parts[i], s.a],
        [parts[i + 1], s.b],
      ] as const) {
        const rad = sub(q, ends(p));
        if (Math.abs(len(rad) - p.radiusMm) > 1e-6) out.push(`${belt.id} span ${i} does not touch ${name(p)}'s pitch circle`);
        if (p.radiusMm > 0 && Math.abs(dot(rad, dir)) > 1e-6 * len(dir) * p.radiusMm)
          out.push(`${belt.id} span ${i} is not tangent to ${name(p)}`);
      }
    });
    if (belt.plane === 'upright') {
      const own = parts.filter((p) => p.kind !== 'clamp');
      for (let i = 0; i < own.length; i++)
        for (let j = i + 1; j < own.length; j++) {
          const d = len(sub(ends(own[i]), ends(own[j])));
          if (d < own[i].radiusMm + own[j].radiusMm + 2 * m - EPS)
            out.push(`${name(own[i])} and ${name(own[j])} overlap in their upright plane`);
        }
    }
  }

  // Pulley against pulley.
  for (let i = 0; i < flat.length; i++) {
    for (let j = i + 1; j < flat.length; j++) {
      const p = flat[i];
      const q = flat[j];
      const d = len(sub(at(p), at(q)));
      const stacked = (p.stackedWith ?? []).includes(q.id) && (q.stackedWith ?? []).includes(p.id);
      if (p.level === q.level) {
        if (d < p.radiusMm + q.radiusMm + 2 * m - EPS) out.push(`${name(p)} and ${name(q)} overlap on level ${p.level}`);
      } else if (d < EPS) {
        if (!stacked) out.push(`${name(p)} and ${name(q)} share an axis without being stacked on one bolt`);
        if (p.kind !== 'idler' || q.kind !== 'idler') out.push(`${name(p)} and ${name(q)}: a motor pulley shares an axis with an idler`);
      } else if (d < Math.max(p.radiusMm, q.radiusMm) + m + SHAFT_MM - EPS) {
        out.push(`the bolt of ${name(p)} or ${name(q)} runs through the other's flange`);
      } else if (stacked) {
        out.push(`${name(p)} and ${name(q)} are listed as stacked but sit apart`);
      }
    }
  }

  for (const s of spans) {
    const ends = [s.from, s.to];
    const endAxes = ends.map(at);
    // Span against pulleys and bolts.
    if (s.flat) {
      for (const p of flat) {
        if (ends.includes(p)) continue;
        const d = pointSegment(at(p), s);
        const onEndAxis = endAxes.some((e) => len(sub(e, at(p))) < EPS);
        if (p.level === s.level && d < p.radiusMm + m - EPS)
          out.push(`${s.belt} span ${name(s.from)}→${name(s.to)} runs through ${name(p)}`);
        if (!onEndAxis && d < SHAFT_MM - EPS) out.push(`${s.belt} span ${name(s.from)}→${name(s.to)} runs through the bolt of ${name(p)}`);
      }
    }
    // Span against the carriage.
    const shrunk = { x0: c.x0 + EPS, y0: c.y0 + EPS, x1: c.x1 - EPS, y1: c.y1 - EPS };
    if (segmentEntersRect(s, shrunk)) out.push(`${s.belt} span ${name(s.from)}→${name(s.to)} runs through the carriage`);
  }

  // Spans against spans on one level.
  for (let i = 0; i < spans.length; i++) {
    for (let j = i + 1; j < spans.length; j++) {
      const s = spans[i];
      const u = spans[j];
      if (s.level !== u.level || !s.flat || !u.flat) continue;
      if (s.belt === u.belt && (s.to === u.from || u.to === s.from)) continue;
      if (segmentSegment(s, u) < pitchMm / 2)
        out.push(
          `spans ${s.belt} ${name(s.from)}→${name(s.to)} and ${u.belt} ${name(u.from)}→${name(u.to)} cross or touch on level ${s.level}`,
        );
    }
  }

  // The carriage against pulleys.
  for (const p of flat) if (pointRect(at(p), c) < p.radiusMm + m - EPS) out.push(`the carriage overlaps ${name(p)}`);
  for (const p of upright) {
    const along = p.radiusMm + m;
    const across = w / 2 + 1;
    const box =
      p.axis === 'x'
        ? { x0: p.xMm - across, x1: p.xMm + across, y0: p.yMm - along, y1: p.yMm + along }
        : { x0: p.xMm - along, x1: p.xMm + along, y0: p.yMm - across, y1: p.yMm + across };
    if (rectsOverlap(box, c)) out.push(`the carriage overlaps ${name(p)}`);
  }

  // Everything inside the frame.
  for (const p of dr.parts) {
    if (p.xMm < 0 || p.yMm < 0 || p.xMm > dr.frame.outerXMm || p.yMm > dr.frame.outerYMm) out.push(`${name(p)} lies outside the frame`);
  }
  return out;
}
