import type { JobResult } from '@/engine';
import { el, INK, line, MUTED, niceTicks, PALETTE, svgDocument, text, tickLabel } from './svg';

export interface JobPathOptions {
  width: number;
  /** Largest height of the plotting area; the area keeps the travel's aspect ratio. */
  maxPlotHeight: number;
  travel: { xMm: number; yMm: number };
  points: readonly { xMm: number; yMm: number }[];
  job: JobResult;
}

const MARGIN = { left: 38, right: 12, top: 16, bottom: 34 };

/**
 * The job's path over the travel (x right, y up, equal scale): the travel as a dotted rectangle, every move as a thin
 * line, the slowest moves thick and dashed (told apart by width and dash, not colour alone) with their numbers, the
 * points as dots and points outside the travel as crosses.
 */
export function jobPathPlot(opts: JobPathOptions): string {
  const xs = [0, opts.travel.xMm, ...opts.points.map((p) => p.xMm)];
  const ys = [0, opts.travel.yMm, ...opts.points.map((p) => p.yMm)];
  const xr = [Math.min(...xs), Math.max(...xs)];
  const yr = [Math.min(...ys), Math.max(...ys)];
  const spanX = Math.max(1e-9, xr[1] - xr[0]);
  const spanY = Math.max(1e-9, yr[1] - yr[0]);
  const availW = opts.width - MARGIN.left - MARGIN.right;
  const scale = Math.min(availW / spanX, opts.maxPlotHeight / spanY);
  const plotW = spanX * scale;
  const plotH = spanY * scale;
  const x0 = MARGIN.left + (availW - plotW) / 2;
  const y0 = MARGIN.top + plotH;
  const sx = (v: number): number => x0 + (v - xr[0]) * scale;
  const sy = (v: number): number => y0 - (v - yr[0]) * scale;
  const parts: string[] = [];
  parts.push(text(opts.width / 2, 9, 'Job path over the travel', { size: 8, bold: true, anchor: 'middle' }));
  parts.push(
    el('rect', {
      x: sx(0),
      y: sy(opts.travel.yMm),
      width: opts.travel.xMm * scale,
      height: opts.travel.yMm * scale,
      fill: 'none',
      stroke: MUTED,
      'stroke-width': 0.6,
      'stroke-dasharray': '2 2',
    }),
  );
  const slow = new Set(opts.job.slowest);
  opts.job.moves.forEach((m, i) => {
    const a = opts.points[m.fromIndex];
    const b = opts.points[m.toIndex];
    if (!a || !b || slow.has(i)) return;
    parts.push(line(sx(a.xMm), sy(a.yMm), sx(b.xMm), sy(b.yMm), { stroke: PALETTE.blue, 'stroke-width': 0.6 }));
  });
  opts.job.slowest.forEach((i) => {
    const m = opts.job.moves[i];
    const a = opts.points[m.fromIndex];
    const b = opts.points[m.toIndex];
    if (!a || !b) return;
    parts.push(
      line(sx(a.xMm), sy(a.yMm), sx(b.xMm), sy(b.yMm), { stroke: PALETTE.vermillion, 'stroke-width': 2, 'stroke-dasharray': '4 1.5' }),
    );
  });
  // Rank tags on top of every line: a white disc with the number, a third of the way along its move.
  opts.job.slowest.forEach((i, rank) => {
    const m = opts.job.moves[i];
    const a = opts.points[m.fromIndex];
    const b = opts.points[m.toIndex];
    if (!a || !b) return;
    const x = sx(a.xMm) + (sx(b.xMm) - sx(a.xMm)) / 3;
    const y = sy(a.yMm) + (sy(b.yMm) - sy(a.yMm)) / 3;
    parts.push(el('circle', { cx: x, cy: y, r: 4.2, fill: '#ffffff', stroke: PALETTE.vermillion, 'stroke-width': 0.8 }));
    parts.push(text(x, y, String(rank + 1), { size: 6, bold: true, anchor: 'middle', middle: true }));
  });
  const outside = new Set(opts.job.outsideTravel);
  opts.points.forEach((p, i) => {
    const x = sx(p.xMm);
    const y = sy(p.yMm);
    if (outside.has(i)) {
      parts.push(line(x - 2.5, y - 2.5, x + 2.5, y + 2.5, { 'stroke-width': 1 }));
      parts.push(line(x - 2.5, y + 2.5, x + 2.5, y - 2.5, { 'stroke-width': 1 }));
    } else parts.push(el('circle', { cx: x, cy: y, r: 1.3, fill: INK }));
  });
  parts.push(el('rect', { x: x0, y: y0 - plotH, width: plotW, height: plotH, fill: 'none', stroke: INK, 'stroke-width': 0.5 }));
  const xTicks = niceTicks(xr[0], xr[1], 6);
  const yTicks = niceTicks(yr[0], yr[1], 6);
  const xStep = xTicks.length > 1 ? xTicks[1] - xTicks[0] : 1;
  const yStep = yTicks.length > 1 ? yTicks[1] - yTicks[0] : 1;
  for (const v of xTicks) {
    parts.push(line(sx(v), y0, sx(v), y0 + 3));
    parts.push(text(sx(v), y0 + 10, tickLabel(v, xStep), { size: 6, anchor: 'middle', fill: MUTED }));
  }
  for (const v of yTicks) {
    parts.push(line(x0 - 3, sy(v), x0, sy(v)));
    parts.push(text(x0 - 5, sy(v), tickLabel(v, yStep), { size: 6, anchor: 'end', middle: true, fill: MUTED }));
  }
  parts.push(text(x0 + plotW / 2, y0 + 21, 'X in travel coordinates [mm]', { size: 6.5, anchor: 'middle' }));
  parts.push(text(x0 - 27, y0 - plotH / 2, 'Y [mm]', { size: 6.5, anchor: 'middle', rotate: -90 }));
  parts.push(
    text(x0, y0 + 31, 'Thick dashed: the slowest moves, numbered slowest first. Dotted: the travel. Crosses: points outside it.', {
      size: 6.5,
    }),
  );
  return svgDocument(opts.width, y0 + MARGIN.bottom, parts);
}
