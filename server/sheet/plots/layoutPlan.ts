import type { LayoutBelt, LayoutDrawing } from '@/engine';
import { beltLook, carriageBox, MOTOR_OUTLINE_MM, markBox, placeLabels, planMarks, type PlanMark } from '@/drawing/layoutPlan';
import { el, escapeXml, GRID, INK, line, MUTED, PALETTE, svgDocument, text } from './svg';

/** Belt colours by slot (Okabe–Ito, as the other plots); the upper level is also dashed, never colour alone. */
export const BELT_COLOURS = [PALETTE.blue, PALETTE.vermillion, PALETTE.purple, PALETTE.orange];
const MOTOR = '#b7791f';

/** A plan of the frame drawn `width` points wide (height follows the frame, at most `maxHeight`). */
interface Frame {
  s: number;
  ox: number;
  oy: number;
  width: number;
  height: number;
  X: (x: number) => number;
  Y: (y: number) => number;
}

function frameOf(dr: LayoutDrawing, width: number, maxHeight: number, pad: number): Frame {
  const W = dr.frame.outerXMm;
  const H = dr.frame.outerYMm;
  const s = Math.min((width - 2 * pad) / W, (maxHeight - 2 * pad) / H);
  const w = W * s + 2 * pad;
  const h = H * s + 2 * pad;
  return { s, ox: (width - w) / 2 + pad, oy: pad, width, height: h, X: (x) => (width - w) / 2 + pad + x * s, Y: (y) => pad + (H - y) * s };
}

function frameBody(dr: LayoutDrawing, f: Frame): string[] {
  const W = dr.frame.outerXMm;
  const H = dr.frame.outerYMm;
  const e = dr.frame.extrusionMm;
  return [
    el('rect', { x: f.X(0), y: f.Y(H), width: W * f.s, height: H * f.s, fill: '#eef1f5', stroke: MUTED, 'stroke-width': 0.8 }),
    el('rect', {
      x: f.X(e),
      y: f.Y(H - e),
      width: (W - 2 * e) * f.s,
      height: (H - 2 * e) * f.s,
      fill: '#ffffff',
      stroke: GRID,
      'stroke-width': 0.5,
    }),
  ];
}

function beltLines(dr: LayoutDrawing, f: Frame, belts: LayoutBelt[], faint: Set<string>): string[] {
  const out: string[] = [];
  // Faint (other) belts first, then by level, so the upper level's dashes lie over the lower where they meet.
  const ordered = [...belts].sort((a, b) => Number(faint.has(b.id)) - Number(faint.has(a.id)) || (a.level ?? 1) - (b.level ?? 1));
  for (const b of ordered) {
    const look = beltLook(dr, b.id);
    const colour = faint.has(b.id) ? GRID : BELT_COLOURS[look.slot % BELT_COLOURS.length];
    for (const sgm of b.segments) {
      out.push(
        line(f.X(sgm.x1Mm), f.Y(sgm.y1Mm), f.X(sgm.x2Mm), f.Y(sgm.y2Mm), {
          stroke: colour,
          'stroke-width': look.dashed ? 0.9 : 1.8,
          'stroke-dasharray': look.dashed ? '3 2' : undefined,
          'stroke-linecap': look.dashed ? 'butt' : 'round',
        }),
      );
    }
  }
  return out;
}

function markShape(dr: LayoutDrawing, f: Frame, m: PlanMark, faint: boolean): string[] {
  const toothed = m.parts.every((p) => p.toothed);
  const fill = faint ? '#ffffff' : m.kind === 'drive' ? MOTOR : '#ffffff';
  const stroke = faint ? GRID : m.kind === 'drive' || toothed ? INK : MUTED;
  const dash = !faint && m.kind !== 'drive' && !toothed ? '1.5 1' : undefined;
  if (m.edgeOn) {
    const b = markBox(m, dr.flangeMm ?? 0, dr.beltWidthMm ?? 6);
    return [
      el('rect', {
        x: f.X(b.x0),
        y: f.Y(b.y1),
        width: (b.x1 - b.x0) * f.s,
        height: (b.y1 - b.y0) * f.s,
        fill,
        stroke,
        'stroke-width': 0.6,
        'stroke-dasharray': dash,
      }),
    ];
  }
  const r = Math.max(m.radiusMm * f.s, 1.6);
  const out = [el('circle', { cx: f.X(m.xMm), cy: f.Y(m.yMm), r, fill, stroke, 'stroke-width': 0.6, 'stroke-dasharray': dash })];
  if (m.parts.length > 1 && !faint) out.push(el('circle', { cx: f.X(m.xMm), cy: f.Y(m.yMm), r: r * 0.4, fill: INK }));
  return out;
}

function labelTexts(dr: LayoutDrawing, f: Frame, marks: PlanMark[], fontPt: number): string[] {
  const labels = placeLabels(dr, marks, { fontMm: fontPt / f.s });
  return labels.flatMap((l) => [
    // A white ground under each name keeps it legible where it crosses a belt line.
    el('rect', {
      x: f.X(l.box.x0),
      y: f.Y(l.box.y1),
      width: (l.box.x1 - l.box.x0) * f.s,
      height: (l.box.y1 - l.box.y0) * f.s,
      rx: 1,
      fill: '#ffffff',
      'fill-opacity': 0.85,
    }),
    el(
      'text',
      {
        x: f.X(l.xMm),
        y: f.Y(l.yMm) + fontPt * 0.36,
        'font-family': 'Inter',
        'font-size': fontPt,
        'font-weight': 'bold',
        'text-anchor': 'middle',
        fill: INK,
      },
      escapeXml(l.text),
    ),
  ]);
}

function carriageRect(dr: LayoutDrawing, f: Frame, fill = '#dbe8f5'): string {
  const c = carriageBox(dr);
  return el('rect', {
    x: f.X(c.x0),
    y: f.Y(c.y1),
    width: (c.x1 - c.x0) * f.s,
    height: (c.y1 - c.y0) * f.s,
    rx: 1.5,
    fill,
    stroke: PALETTE.blue,
    'stroke-width': 0.7,
  });
}

function gantryRect(dr: LayoutDrawing, f: Frame): string {
  const g = dr.gantry;
  return el('rect', {
    x: f.X(g.fromXMm),
    y: f.Y(g.yMm + g.depthMm / 2),
    width: (g.toXMm - g.fromXMm) * f.s,
    height: g.depthMm * f.s,
    fill: '#e4e7ec',
  });
}

function clampDots(dr: LayoutDrawing, f: Frame, belts: Set<string>): string[] {
  return dr.parts
    .filter((p) => p.kind === 'clamp' && belts.has(p.belt))
    .map((p) => el('rect', { x: f.X(p.xMm) - 1.2, y: f.Y(p.yMm) - 1.2, width: 2.4, height: 2.4, fill: INK }));
}

/**
 * The whole layout in plan at the parking position: frame, gantry, carriage, motors (pulley filled, dashed motor
 * outline), every pulley named as in the span table, stacked idlers as one mark, belts in their colours with the
 * upper level dashed over the lower.
 * @param dr - layout drawing
 * @param width - drawing width [pt]
 * @param maxHeight - largest height [pt]
 * @returns SVG document
 */
export function layoutPlanSvg(dr: LayoutDrawing, width: number, maxHeight: number): string {
  const f = frameOf(dr, width, maxHeight, 10);
  const marks = planMarks(dr);
  const motors = marks.filter((m) => m.kind === 'drive' && m.edgeOn === null);
  const body = [
    ...frameBody(dr, f),
    gantryRect(dr, f),
    ...motors.map((m) =>
      el('rect', {
        x: f.X(m.xMm - MOTOR_OUTLINE_MM / 2),
        y: f.Y(m.yMm + MOTOR_OUTLINE_MM / 2),
        width: MOTOR_OUTLINE_MM * f.s,
        height: MOTOR_OUTLINE_MM * f.s,
        rx: 1.5,
        fill: '#f6ead6',
        stroke: MOTOR,
        'stroke-width': 0.6,
        'stroke-dasharray': '2 1.5',
      }),
    ),
    ...beltLines(dr, f, dr.belts, new Set()),
    carriageRect(dr, f),
    ...clampDots(dr, f, new Set(dr.belts.map((b) => b.id))),
    ...marks.flatMap((m) => markShape(dr, f, m, false)),
    ...labelTexts(dr, f, marks, 6.5),
  ];
  return svgDocument(width, f.height, body);
}

/**
 * One belt alone, for following its path against the span table. A flat belt in plan, the other belts faint; an
 * upright belt in its own plane (along X or Y against height), its clamps and pulleys named.
 * @param dr - layout drawing
 * @param beltId - belt to draw
 * @param width - drawing width [pt]
 * @param maxHeight - largest height [pt]
 * @returns SVG document
 */
export function beltPathSvg(dr: LayoutDrawing, beltId: string, width: number, maxHeight: number): string {
  const belt = dr.belts.find((b) => b.id === beltId);
  if (!belt) return svgDocument(width, 20, text(4, 12, `belt ${beltId} not in this result`, { size: 6.5, fill: MUTED }));
  if (belt.plane === 'upright' && belt.elevation) return uprightSvg(dr, belt, width, maxHeight);
  const f = frameOf(dr, width, maxHeight, 8);
  const others = new Set(dr.belts.filter((b) => b.id !== beltId).map((b) => b.id));
  const marks = planMarks(dr, [beltId]);
  const body = [
    ...frameBody(dr, f),
    gantryRect(dr, f),
    ...beltLines(dr, f, dr.belts, others),
    carriageRect(dr, f),
    ...clampDots(dr, f, new Set([beltId])),
    ...marks.flatMap((m) => markShape(dr, f, m, false)),
    ...labelTexts(dr, f, marks, 6),
  ];
  return svgDocument(width, f.height, body);
}

function uprightSvg(dr: LayoutDrawing, belt: LayoutBelt, width: number, maxHeight: number): string {
  const ev = belt.elevation!;
  const parts = dr.parts.filter((p) => p.belt === belt.id);
  const along = (p: { xMm: number; yMm: number }) => (ev.along === 'y' ? p.yMm : p.xMm);
  const span = ev.along === 'y' ? dr.frame.outerYMm : dr.frame.outerXMm;
  const zMax = Math.max(...parts.map((p) => (p.zMm ?? 0) + p.radiusMm), 1);
  const pad = 12;
  const s = Math.min((width - 2 * pad) / span, (maxHeight - 2 * pad) / (zMax * 6));
  // Heights are drawn 3× so that the two runs of a long, low loop read apart; the note under the drawing says so.
  const zs = 3 * s;
  const U = (u: number) => pad + u * s;
  const Z = (z: number) => pad + (zMax - z) * zs;
  const height = Z(0) + 18;
  const look = beltLook(dr, belt.id);
  const colour = BELT_COLOURS[look.slot % BELT_COLOURS.length];
  const body: string[] = [
    line(U(0), Z(0) + 6, U(span), Z(0) + 6, { stroke: MUTED, 'stroke-width': 0.6 }),
    text(U(0), Z(0) + 13, ev.along === 'y' ? 'front' : 'left end', { size: 5.5, fill: MUTED }),
    text(U(span), Z(0) + 13, ev.along === 'y' ? 'back' : 'right end', { size: 5.5, fill: MUTED, anchor: 'end' }),
  ];
  for (const sg of ev.segments) {
    body.push(line(U(sg.u1Mm), Z(sg.z1Mm), U(sg.u2Mm), Z(sg.z2Mm), { stroke: colour, 'stroke-width': 1.6, 'stroke-linecap': 'round' }));
  }
  for (const p of parts) {
    const x = U(along(p));
    const y = Z(p.zMm ?? 0);
    if (p.kind === 'clamp') {
      body.push(el('rect', { x: x - 1.5, y: y - 1.5, width: 3, height: 3, fill: INK }));
      continue;
    }
    body.push(
      el('ellipse', {
        cx: x,
        cy: y,
        rx: Math.max(p.radiusMm * s, 1.5),
        ry: Math.max(p.radiusMm * zs, 1.5),
        fill: p.kind === 'drive' ? MOTOR : '#ffffff',
        stroke: INK,
        'stroke-width': 0.6,
      }),
    );
    const right = along(p) < span / 2;
    body.push(
      text(x + (right ? 1 : -1) * (p.radiusMm * s + 4), y - p.radiusMm * zs - 2, p.tag || '', {
        size: 6,
        bold: true,
        anchor: right ? 'start' : 'end',
      }),
    );
  }
  return svgDocument(width, height, body);
}

/**
 * The travel origin and the parking position on a small plan: the travel rectangle of the carriage centre, travel
 * (0, 0) at its front-left corner with +X and +Y arrows, and the carriage drawn where it parks for plucking.
 * @param dr - layout drawing (at the parking position)
 * @param travel - travel along X and Y [mm], for the corner labels
 * @param parking - parking position in travel coordinates [mm]
 * @param width - drawing width [pt]
 * @param maxHeight - largest height [pt]
 * @param position - the parking label's coordinates in words (default "X 12.3, Y 45.6 mm"); the sheet passes its unit system's
 * @returns SVG document
 */
export function originPlanSvg(
  dr: LayoutDrawing,
  travel: { xMm: number; yMm: number },
  parking: { xMm: number; yMm: number },
  width: number,
  maxHeight: number,
  position?: (xMm: number, yMm: number) => string,
): string {
  const f = frameOf(dr, width, maxHeight, 14);
  const t = dr.travel;
  const green = PALETTE.green;
  const arrow = Math.max(18, Math.min(travel.xMm, travel.yMm) * f.s * 0.35);
  const x0 = f.X(t.fromXMm);
  const y0 = f.Y(t.fromYMm);
  const head = (x: number, y: number, dx: number, dy: number) =>
    el('path', {
      d: `M${x} ${y} L${x - dx * 4 - dy * 2.2} ${y - dy * 4 + dx * 2.2} L${x - dx * 4 + dy * 2.2} ${y - dy * 4 - dx * 2.2} Z`,
      fill: green,
    });
  const px = f.X(dr.carriage.xMm);
  const py = f.Y(dr.carriage.yMm);
  const fmt = (v: number) => (Math.round(v * 10) / 10).toFixed(1);
  const body = [
    ...frameBody(dr, f),
    el('rect', {
      x: x0,
      y: f.Y(t.toYMm),
      width: (t.toXMm - t.fromXMm) * f.s,
      height: (t.toYMm - t.fromYMm) * f.s,
      fill: '#e6f4ef',
      stroke: green,
      'stroke-width': 0.7,
      'stroke-dasharray': '3 2',
    }),
    carriageRect(dr, f, 'rgba(219,232,245,0.7)'),
    line(px - 4, py, px + 4, py, { stroke: PALETTE.blue, 'stroke-width': 0.8 }),
    line(px, py - 4, px, py + 4, { stroke: PALETTE.blue, 'stroke-width': 0.8 }),
    text(
      px,
      f.Y(dr.carriage.yMm + dr.carriage.depthMm / 2) - 3,
      `parking: ${position ? position(parking.xMm, parking.yMm) : `X ${fmt(parking.xMm)}, Y ${fmt(parking.yMm)} mm`}`,
      {
        size: 6,
        bold: true,
        anchor: 'middle',
        fill: PALETTE.blue,
      },
    ),
    line(x0, y0, x0 + arrow, y0, { stroke: green, 'stroke-width': 1.1 }),
    head(x0 + arrow, y0, 1, 0),
    line(x0, y0, x0, y0 - arrow, { stroke: green, 'stroke-width': 1.1 }),
    head(x0, y0 - arrow, 0, -1),
    el('circle', { cx: x0, cy: y0, r: 2, fill: green }),
    text(x0 + arrow + 7, y0 + 2.2, '+X', { size: 6.5, bold: true, fill: green }),
    text(x0 - 4, y0 - arrow + 2, '+Y', { size: 6.5, bold: true, fill: green, anchor: 'end' }),
    text(x0 - 3, y0 + 8, 'origin (0, 0)', { size: 6, bold: true, fill: green, anchor: 'end' }),
    text(f.X(t.toXMm), f.Y(t.toYMm) - 3, `(${fmt(travel.xMm)}, ${fmt(travel.yMm)})`, { size: 5.5, fill: green, anchor: 'end' }),
    text(f.X(dr.frame.outerXMm / 2), f.Y(0) + 9, 'front of the machine', { size: 5.5, fill: MUTED, anchor: 'middle' }),
  ];
  return svgDocument(width, f.height + 4, body);
}
