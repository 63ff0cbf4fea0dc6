import { el, INK, line, MUTED, niceTicks, svgDocument, text, tickLabel, viridis } from './svg';

export interface HeatmapOptions {
  width: number;
  /** Largest height of the plotting area; the area keeps the travel's aspect ratio. */
  maxPlotHeight: number;
  title: string;
  xTitle: string;
  yTitle: string;
  barTitle: string;
  xMm: readonly number[];
  yMm: readonly number[];
  /** values[iy][ix] */
  values: readonly (readonly number[])[];
  min: { value: number; xMm: number; yMm: number; label: string };
}

const MARGIN = { left: 38, right: 58, top: 18, bottom: 30 };
/** Colour steps of the map and its colour bar. */
const LEVELS = 48;

function r2(v: number): string {
  return String(Math.round(v * 100) / 100);
}

/** Cell edges halfway between grid points, clamped to the grid's own extent. */
function edges(points: readonly number[]): number[] {
  const n = points.length;
  if (n === 1) return [points[0] - 0.5, points[0] + 0.5];
  const out = [points[0]];
  for (let i = 0; i < n - 1; i += 1) out.push((points[i] + points[i + 1]) / 2);
  out.push(points[n - 1]);
  return out;
}

/**
 * A heat map over the travel (x right, y up, equal scale on both axes) in viridis, with a colour bar
 * in the value's unit and the minimum marked by a ringed cross and a label.
 */
export function heatmap(opts: HeatmapOptions): string {
  const xs = opts.xMm;
  const ys = opts.yMm;
  const xRange = [xs[0], xs[xs.length - 1]];
  const yRange = [ys[0], ys[ys.length - 1]];
  const spanX = Math.max(1e-9, xRange[1] - xRange[0]);
  const spanY = Math.max(1e-9, yRange[1] - yRange[0]);
  const availW = opts.width - MARGIN.left - MARGIN.right;
  const scale = Math.min(availW / spanX, opts.maxPlotHeight / spanY);
  const plotW = spanX * scale;
  const plotH = spanY * scale;
  const x0 = MARGIN.left + (availW - plotW) / 2;
  const y0 = MARGIN.top + plotH;
  const h = MARGIN.top + plotH + MARGIN.bottom + 12;
  const sx = (v: number): number => x0 + (v - xRange[0]) * scale;
  const sy = (v: number): number => y0 - (v - yRange[0]) * scale;

  const finite = opts.values.flat().filter(Number.isFinite);
  const vMin = Math.min(...finite);
  const vMax = Math.max(...finite);
  const span = vMax - vMin || 1;
  const t = (v: number): number => (v - vMin) / span;

  const parts: string[] = [];
  parts.push(text(opts.width / 2, 9, opts.title, { size: 8, bold: true, anchor: 'middle' }));
  const ex = edges(xs);
  const ey = edges(ys);
  // Colours are quantised to LEVELS steps and every level is one path of rectangles (runs of equal cells merged
  // along a row): a 101 × 101 map stays a few dozen elements, which keeps the SVG quick to lay out and embed.
  // Half a point of overlap hides the hairline seams viewers draw between abutting cells.
  const overlap = 0.5;
  const level = (v: number): number => Math.round(t(v) * (LEVELS - 1));
  const runs = new Map<number, string[]>();
  const missing: string[] = [];
  for (let iy = 0; iy < ys.length; iy += 1) {
    const top = sy(ey[iy + 1]);
    const height = sy(ey[iy]) - top + overlap;
    let ix = 0;
    while (ix < xs.length) {
      const v = opts.values[iy]?.[ix];
      const lv = Number.isFinite(v) ? level(v) : -1;
      let end = ix + 1;
      while (end < xs.length) {
        const w = opts.values[iy]?.[end];
        if ((Number.isFinite(w) ? level(w) : -1) !== lv) break;
        end += 1;
      }
      const left = sx(ex[ix]);
      const rect = `M${r2(left)} ${r2(top)}h${r2(sx(ex[end]) - left + overlap)}v${r2(height)}h${r2(-(sx(ex[end]) - left + overlap))}Z`;
      if (lv < 0) missing.push(rect);
      else {
        const list = runs.get(lv) ?? [];
        list.push(rect);
        runs.set(lv, list);
      }
      ix = end;
    }
  }
  for (const [lv, rects] of [...runs.entries()].sort((a, b) => a[0] - b[0])) {
    parts.push(el('path', { d: rects.join(''), fill: viridis(lv / (LEVELS - 1)) }));
  }
  if (missing.length) parts.push(el('path', { d: missing.join(''), fill: '#ffffff' }));
  parts.push(el('rect', { x: x0, y: y0 - plotH, width: plotW, height: plotH, fill: 'none', stroke: INK, 'stroke-width': 0.6 }));

  const xTicks = niceTicks(xRange[0], xRange[1], 6);
  const yTicks = niceTicks(yRange[0], yRange[1], 6);
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
  parts.push(text(x0 + plotW / 2, y0 + 21, opts.xTitle, { size: 6.5, anchor: 'middle' }));
  parts.push(text(x0 - 27, y0 - plotH / 2, opts.yTitle, { size: 6.5, anchor: 'middle', rotate: -90 }));

  // Minimum: white ring and black cross, readable on every viridis colour.
  const mx = sx(opts.min.xMm);
  const my = sy(opts.min.yMm);
  parts.push(el('circle', { cx: mx, cy: my, r: 4.5, fill: 'none', stroke: '#ffffff', 'stroke-width': 2.2 }));
  parts.push(el('circle', { cx: mx, cy: my, r: 4.5, fill: 'none', stroke: INK, 'stroke-width': 0.9 }));
  parts.push(line(mx - 2.5, my, mx + 2.5, my, { 'stroke-width': 0.9 }));
  parts.push(line(mx, my - 2.5, mx, my + 2.5, { 'stroke-width': 0.9 }));
  parts.push(text(x0, y0 + 31, `Marked: ${opts.min.label}`, { size: 6.5 }));

  // Colour bar.
  const bx = x0 + plotW + 14;
  const bw = 9;
  for (let i = 0; i < LEVELS; i += 1) {
    // Same steps as the map: level k covers values whose quantised level is k.
    const yTop = y0 - plotH + (i * plotH) / LEVELS;
    parts.push(el('rect', { x: bx, y: yTop, width: bw, height: plotH / LEVELS + 0.25, fill: viridis((LEVELS - 1 - i) / (LEVELS - 1)) }));
  }
  parts.push(el('rect', { x: bx, y: y0 - plotH, width: bw, height: plotH, fill: 'none', stroke: INK, 'stroke-width': 0.6 }));
  const bTicks = niceTicks(vMin, vMax, 5);
  const bStep = bTicks.length > 1 ? bTicks[1] - bTicks[0] : 1;
  for (const v of bTicks) {
    const y = y0 - t(v) * plotH;
    parts.push(line(bx + bw, y, bx + bw + 3, y));
    parts.push(text(bx + bw + 5, y, tickLabel(v, bStep), { size: 6, middle: true, fill: MUTED }));
  }
  parts.push(text(bx + bw + 30, y0 - plotH / 2, opts.barTitle, { size: 6.5, anchor: 'middle', rotate: -90 }));
  return svgDocument(opts.width, h, parts);
}
