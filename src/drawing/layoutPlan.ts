/**
 * Shared geometry for drawing a belt layout in plan — the Design desk sketch and the design sheet both use it, so
 * both show the same names in the same places. Pure TypeScript (no DOM, no Node): coordinates are the engine's
 * plan millimetres (origin at the frame's outer front-left corner, Y toward the back); renderers flip Y.
 * The conventions are those of docs/models/belt-layout.md "Drawings".
 */
import type { LayoutDrawing, LayoutPart } from '@/engine';

/** A box in plan millimetres. */
export interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** One place on the plan: a pulley, or the idlers stacked on one bolt there. */
export interface PlanMark {
  key: string;
  /** The parts at this place, lowest level first. */
  parts: LayoutPart[];
  /** Span-table names, e.g. "A3/B4" for a stacked pair. */
  text: string;
  xMm: number;
  yMm: number;
  radiusMm: number;
  kind: 'drive' | 'idler';
  /** Seen edge-on in plan (an upright loop): along which axis the belt runs past it. */
  edgeOn: 'x' | 'y' | null;
}

/** A label placed clear of the pulleys, the carriage and the other labels; (xMm, yMm) is the text's centre. */
export interface PlacedLabel {
  key: string;
  text: string;
  xMm: number;
  yMm: number;
  box: Box;
  /** Pulley the label belongs to, for a leader line when the label sits away from it. */
  forXMm: number;
  forYMm: number;
}

/** Typical stepper outline drawn round a motor pulley [mm]: the common 42 mm frame size (NEMA 17). */
export const MOTOR_OUTLINE_MM = 42.3;

/**
 * Pulleys grouped by place: stacked idlers (same centre, different levels) become one mark with both names.
 * @param dr - layout drawing
 * @param belts - belts to include (all when left out)
 * @returns marks, drive pulleys first
 */
export function planMarks(dr: LayoutDrawing, belts?: string[]): PlanMark[] {
  const marks: PlanMark[] = [];
  for (const p of dr.parts) {
    if (p.kind === 'clamp' || (belts && !belts.includes(p.belt))) continue;
    const same = marks.find((m) => Math.hypot(m.xMm - p.xMm, m.yMm - p.yMm) < 1e-6 && m.edgeOn === edgeOf(p));
    if (same) {
      same.parts.push(p);
      same.parts.sort((a, b) => (a.level ?? 1) - (b.level ?? 1));
      same.text = same.parts.map(nameOf).filter(Boolean).join('/');
      same.radiusMm = Math.max(same.radiusMm, p.radiusMm);
      if (p.kind === 'drive') same.kind = 'drive';
      continue;
    }
    marks.push({
      key: p.id,
      parts: [p],
      text: nameOf(p),
      xMm: p.xMm,
      yMm: p.yMm,
      radiusMm: p.radiusMm,
      kind: p.kind === 'drive' ? 'drive' : 'idler',
      edgeOn: edgeOf(p),
    });
  }
  return marks.sort((a, b) => (a.kind === b.kind ? 0 : a.kind === 'drive' ? -1 : 1));
}

function edgeOf(p: LayoutPart): 'x' | 'y' | null {
  // A pulley whose axis runs along X is seen edge-on with the belt running past it along Y, and the other way round.
  return p.axis === 'x' ? 'y' : p.axis === 'y' ? 'x' : null;
}

/** Name shown for a part: its tag, or for results of engine 1.0 (no tags) the motor letter or nothing. */
export function nameOf(p: LayoutPart): string {
  if (p.tag) return p.tag;
  return p.kind === 'drive' && p.motor ? p.motor : '';
}

/** The plan footprint of a mark (flanged disc as its box, or an edge-on pulley). */
export function markBox(m: PlanMark, flangeMm: number, beltWidthMm: number): Box {
  const along = m.radiusMm + flangeMm;
  const across = beltWidthMm / 2 + 1;
  if (m.edgeOn === 'x') return { x0: m.xMm - along, x1: m.xMm + along, y0: m.yMm - across, y1: m.yMm + across };
  if (m.edgeOn === 'y') return { x0: m.xMm - across, x1: m.xMm + across, y0: m.yMm - along, y1: m.yMm + along };
  return { x0: m.xMm - along, x1: m.xMm + along, y0: m.yMm - along, y1: m.yMm + along };
}

function overlap(a: Box, b: Box): number {
  const w = Math.min(a.x1, b.x1) - Math.max(a.x0, b.x0);
  const h = Math.min(a.y1, b.y1) - Math.max(a.y0, b.y0);
  return w > 0 && h > 0 ? w * h : 0;
}

/** Box of the carriage as drawn. */
export function carriageBox(dr: LayoutDrawing): Box {
  const c = dr.carriage;
  return { x0: c.xMm - c.widthMm / 2, x1: c.xMm + c.widthMm / 2, y0: c.yMm - c.depthMm / 2, y1: c.yMm + c.depthMm / 2 };
}

/**
 * Places one label per mark where it covers no pulley, the carriage or another label: eight directions round the
 * mark, nearest first, preferring the side toward the middle of the frame; if every place is taken, the least
 * covered one.
 * @param dr - layout drawing
 * @param marks - marks to label
 * @param opts.fontMm - text height in plan millimetres
 * @param opts.charMm - average character width (default 0.62 × font)
 * @param opts.avoid - further boxes to keep clear of
 * @returns one label per mark with a text
 */
export function placeLabels(dr: LayoutDrawing, marks: PlanMark[], opts: { fontMm: number; charMm?: number; avoid?: Box[] }): PlacedLabel[] {
  const flange = dr.flangeMm ?? 0;
  const width = dr.beltWidthMm ?? 6;
  const font = opts.fontMm;
  const charW = opts.charMm ?? 0.62 * font;
  const obstacles: Box[] = [...marks.map((m) => markBox(m, flange, width)), carriageBox(dr), ...(opts.avoid ?? [])];
  const placed: PlacedLabel[] = [];
  const cx = dr.frame.outerXMm / 2;
  const cy = dr.frame.outerYMm / 2;
  const pad = font;
  const bounds: Box = { x0: -pad, y0: -pad, x1: dr.frame.outerXMm + pad, y1: dr.frame.outerYMm + pad };
  for (const m of marks) {
    if (!m.text) continue;
    const w = m.text.length * charW + 0.3 * font;
    const h = font * 1.15;
    const home = markBox(m, flange, width);
    const toward = Math.atan2(cy - m.yMm, cx - m.xMm);
    let best: { cost: number; box: Box; x: number; y: number } | null = null;
    for (const step of [0, 1, 2]) {
      for (let k = 0; k < 8; k++) {
        // Alternate either side of the preferred direction: 0, +45°, −45°, +90° …
        const turn = (k % 2 === 0 ? 1 : -1) * Math.ceil(k / 2) * (Math.PI / 4);
        const a = Math.round((toward + turn) / (Math.PI / 4)) * (Math.PI / 4);
        const ux = Math.round(Math.cos(a) * 1e9) / 1e9;
        const uy = Math.round(Math.sin(a) * 1e9) / 1e9;
        const gap = 0.25 * font + step * font;
        const x = m.xMm + ux * ((home.x1 - home.x0) / 2 + w / 2 + gap);
        const y = m.yMm + uy * ((home.y1 - home.y0) / 2 + h / 2 + gap);
        const box = { x0: x - w / 2, x1: x + w / 2, y0: y - h / 2, y1: y + h / 2 };
        let cost = step * 0.01 * w * h;
        for (const o of obstacles) cost += overlap(box, o);
        for (const l of placed) cost += 4 * overlap(box, l.box);
        const inside = box.x0 >= bounds.x0 && box.x1 <= bounds.x1 && box.y0 >= bounds.y0 && box.y1 <= bounds.y1;
        if (!inside) cost += w * h * 10;
        if (!best || cost < best.cost - 1e-9) best = { cost, box, x, y };
      }
      if (best && best.cost <= step * 0.01 * w * h + 1e-9) break;
    }
    placed.push({ key: m.key, text: m.text, xMm: best!.x, yMm: best!.y, box: best!.box, forXMm: m.xMm, forYMm: m.yMm });
  }
  return placed;
}

/** How a belt is drawn: its colour slot, and dashed when it runs on the upper level (drawn over the lower). */
export function beltLook(dr: LayoutDrawing, beltId: string): { slot: number; dashed: boolean; level: number } {
  const slot = Math.max(
    0,
    dr.belts.findIndex((b) => b.id === beltId),
  );
  const belt = dr.belts[slot];
  const level = belt?.level ?? 1;
  return { slot, dashed: level === 2 && hasTwoLevels(dr), level };
}

function hasTwoLevels(dr: LayoutDrawing): boolean {
  return (dr.levels?.length ?? 1) > 1;
}

/** Legend words for each belt: "belt A — lower level, solid". */
export function beltLegend(dr: LayoutDrawing): { id: string; text: string; slot: number; dashed: boolean }[] {
  return dr.belts.map((b) => {
    const look = beltLook(dr, b.id);
    const level = dr.levels?.find((l) => l.level === b.level)?.label;
    const label = b.label ?? `belt ${b.id}`;
    return {
      id: b.id,
      slot: look.slot,
      dashed: look.dashed,
      text: level ? `${label} — ${level}${b.plane === 'upright' ? ', upright' : ''}` : label,
    };
  });
}
