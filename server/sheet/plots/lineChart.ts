import { el, GRID, INK, line, MUTED, niceMax, niceTicks, pathThrough, svgDocument, text, tickLabel } from './svg';

export interface LineSeries {
  label: string;
  x: readonly number[];
  y: readonly number[];
  color: string;
  dash?: string;
}

/** A marked operating point; `shape` keeps points apart without relying on colour. */
export interface ChartPoint {
  x: number;
  y: number;
  label: string;
  shape: 'circle' | 'square' | 'diamond' | 'triangle';
  /** Filled black instead of hollow. */
  filled?: boolean;
}

export interface LineChartOptions {
  width: number;
  height: number;
  title: string;
  xTitle: string;
  yTitle: string;
  series: readonly LineSeries[];
  points?: readonly ChartPoint[];
  xMax?: number;
  yMax?: number;
}

const MARGIN = { left: 40, right: 10, top: 18, bottom: 28 };
const LEGEND_ROW = 10;

/** Marker of the given shape centred on (x, y). */
export function marker(shape: ChartPoint['shape'], x: number, y: number, size = 3, filled = false): string {
  const style = { fill: filled ? INK : '#ffffff', stroke: INK, 'stroke-width': 1 };
  switch (shape) {
    case 'circle':
      return el('circle', { cx: x, cy: y, r: size, ...style });
    case 'square':
      return el('rect', { x: x - size, y: y - size, width: size * 2, height: size * 2, ...style });
    case 'diamond':
      return el('path', {
        d: pathThrough(
          [
            [x, y - size * 1.3],
            [x + size * 1.3, y],
            [x, y + size * 1.3],
            [x - size * 1.3, y],
          ],
          true,
        ),
        ...style,
      });
    case 'triangle':
      return el('path', {
        d: pathThrough(
          [
            [x, y - size * 1.3],
            [x + size * 1.2, y + size * 0.9],
            [x - size * 1.2, y + size * 0.9],
          ],
          true,
        ),
        ...style,
      });
  }
}

/**
 * An XY line chart from zero on both axes, with round ticks, grid, axis titles (with units),
 * a legend below and optional marked points.
 */
export function lineChart(opts: LineChartOptions): string {
  const legendRows = opts.series.length + (opts.points?.length ?? 0);
  const h = opts.height + legendRows * LEGEND_ROW + 4;
  const x0 = MARGIN.left;
  const x1 = opts.width - MARGIN.right;
  const y0 = opts.height - MARGIN.bottom;
  const y1 = MARGIN.top;
  const allX = opts.series.flatMap((s) => s.x).concat((opts.points ?? []).map((p) => p.x));
  const allY = opts.series.flatMap((s) => s.y).concat((opts.points ?? []).map((p) => p.y));
  const xMax = opts.xMax ?? niceMax(Math.max(0, ...allX), 6);
  const yMax = opts.yMax ?? niceMax(Math.max(0, ...allY), 5);
  const sx = (v: number): number => x0 + (Math.min(Math.max(v, 0), xMax) / xMax) * (x1 - x0);
  const sy = (v: number): number => y0 - (Math.min(Math.max(v, 0), yMax) / yMax) * (y0 - y1);

  const parts: string[] = [];
  parts.push(text(opts.width / 2, 9, opts.title, { size: 8, bold: true, anchor: 'middle' }));
  const xTicks = niceTicks(0, xMax, 6);
  const yTicks = niceTicks(0, yMax, 5);
  const xStep = xTicks.length > 1 ? xTicks[1] - xTicks[0] : xMax;
  const yStep = yTicks.length > 1 ? yTicks[1] - yTicks[0] : yMax;
  for (const t of xTicks) {
    parts.push(line(sx(t), y0, sx(t), y1, { stroke: GRID, 'stroke-width': 0.5 }));
    parts.push(line(sx(t), y0, sx(t), y0 + 3, { stroke: INK }));
    parts.push(text(sx(t), y0 + 10, tickLabel(t, xStep), { size: 6, anchor: 'middle', fill: MUTED }));
  }
  for (const t of yTicks) {
    parts.push(line(x0, sy(t), x1, sy(t), { stroke: GRID, 'stroke-width': 0.5 }));
    parts.push(line(x0 - 3, sy(t), x0, sy(t), { stroke: INK }));
    parts.push(text(x0 - 5, sy(t), tickLabel(t, yStep), { size: 6, anchor: 'end', middle: true, fill: MUTED }));
  }
  parts.push(el('rect', { x: x0, y: y1, width: x1 - x0, height: y0 - y1, fill: 'none', stroke: INK, 'stroke-width': 0.6 }));
  parts.push(text((x0 + x1) / 2, y0 + 21, opts.xTitle, { size: 6.5, anchor: 'middle' }));
  parts.push(text(10, (y0 + y1) / 2, opts.yTitle, { size: 6.5, anchor: 'middle', rotate: -90 }));

  for (const s of opts.series) {
    const pts: [number, number][] = s.x.map((x, i) => [sx(x), sy(s.y[i])]);
    parts.push(
      el('path', {
        d: pathThrough(pts),
        fill: 'none',
        stroke: s.color,
        'stroke-width': 1.3,
        'stroke-dasharray': s.dash,
        'stroke-linejoin': 'round',
      }),
    );
  }
  for (const p of opts.points ?? []) parts.push(marker(p.shape, sx(p.x), sy(p.y), 3, p.filled));

  let ly = opts.height + 4;
  for (const s of opts.series) {
    parts.push(line(x0, ly, x0 + 20, ly, { stroke: s.color, 'stroke-width': 1.3, 'stroke-dasharray': s.dash }));
    parts.push(text(x0 + 25, ly, s.label, { size: 6.5, middle: true }));
    ly += LEGEND_ROW;
  }
  for (const p of opts.points ?? []) {
    parts.push(marker(p.shape, x0 + 10, ly, 2.6, p.filled));
    parts.push(text(x0 + 25, ly, p.label, { size: 6.5, middle: true }));
    ly += LEGEND_ROW;
  }
  return svgDocument(opts.width, h, parts);
}
