import { el, GRID, INK, line, MUTED, niceMax, niceTicks, pathThrough, svgDocument, text, tickLabel } from './svg';

/** One curve of a polar plot; the radius is |value|. */
export interface PolarSeries {
  label: string;
  /** One value per direction of `directionsDeg`. */
  values: readonly number[];
  color: string;
  /** Dash pattern for the whole curve (unsigned series). */
  dash?: string;
  /** Signed series: positive runs solid, negative runs dashed, with "+"/"−" labels at the lobe tips. */
  signed?: boolean;
  /** Short direct label (motor letter) printed with the sign inside each lobe of a signed series. */
  tag?: string;
}

/** A marked point on a polar plot. */
export interface PolarMarker {
  directionDeg: number;
  value: number;
  label: string;
}

export interface PolarPlotOptions {
  width: number;
  title: string;
  /** What the radius means, with its unit, printed under the title. */
  radiusTitle: string;
  directionsDeg: readonly number[];
  series: readonly PolarSeries[];
  markers?: readonly PolarMarker[];
  /** Fixed outer radius value; by default a round number above the largest value. */
  rMax?: number;
}

const NEGATIVE_DASH = '3 2';
const TITLE_H = 24;
const LABEL_PAD = 16;
const LEGEND_ROW = 11;

interface Run {
  positive: boolean;
  points: [number, number][];
}

/** Split a closed signed curve into same-sign runs that meet at the centre where the value crosses zero. */
function signedRuns(
  directionsDeg: readonly number[],
  values: readonly number[],
  toXY: (deg: number, r: number) => [number, number],
): Run[] {
  const n = Math.min(directionsDeg.length, values.length);
  if (n === 0) return [];
  const positive = (v: number): boolean => v >= 0;
  let start = 0;
  for (let i = 0; i < n; i += 1) {
    if (positive(values[i]) !== positive(values[(i - 1 + n) % n])) {
      start = i;
      break;
    }
  }
  const runs: Run[] = [];
  let current: Run = { positive: positive(values[start]), points: [] };
  for (let k = 0; k < n; k += 1) {
    const i = (start + k) % n;
    const j = (i + 1) % n;
    current.points.push(toXY(directionsDeg[i], Math.abs(values[i])));
    if (positive(values[j]) !== positive(values[i])) {
      let span = directionsDeg[j] - directionsDeg[i];
      if (span <= 0) span += 360;
      const t = values[i] / (values[i] - values[j]);
      const centre = toXY(directionsDeg[i] + t * span, 0);
      current.points.push(centre);
      runs.push(current);
      current = { positive: positive(values[j]), points: [centre] };
    }
  }
  current.points.push(toXY(directionsDeg[start], Math.abs(values[start])));
  runs.push(current);
  return runs;
}

function extremeIndex(values: readonly number[], sign: 1 | -1): number {
  let best = -1;
  for (let i = 0; i < values.length; i += 1) {
    if (sign * values[i] > 0 && (best < 0 || sign * values[i] > sign * values[best])) best = i;
  }
  return best;
}

/**
 * A polar plot over 0–360° (0° = +X, counter-clockwise, 90° = +Y) with round radial grid circles,
 * 30° spokes, a legend and optional markers. Returns an SVG document `width` points wide.
 */
export function polarPlot(opts: PolarPlotOptions): string {
  const w = opts.width;
  const legendRows = opts.series.length + (opts.markers?.length ?? 0);
  const plotSize = w;
  const h = TITLE_H + plotSize + legendRows * LEGEND_ROW + 4;
  const cx = w / 2;
  const cy = TITLE_H + plotSize / 2;
  const radius = plotSize / 2 - LABEL_PAD - 4;
  const largest = Math.max(0, ...opts.series.flatMap((s) => s.values.map((v) => Math.abs(v))));
  const rMax = opts.rMax ?? niceMax(largest, 3);
  const ticks = niceTicks(0, rMax, 3).filter((t) => t > 0);
  const step = ticks.length > 1 ? ticks[1] - ticks[0] : rMax;
  const toXY = (deg: number, r: number): [number, number] => {
    const a = (deg * Math.PI) / 180;
    const rr = (Math.min(r, rMax) / rMax) * radius;
    return [cx + rr * Math.cos(a), cy - rr * Math.sin(a)];
  };
  // Radial ticks sit between the 60° and 90° spokes, clear of the spoke labels.
  const TICK_DEG = 75;

  const parts: string[] = [];
  parts.push(text(cx, 10, opts.title, { size: 8, bold: true, anchor: 'middle' }));
  parts.push(text(cx, 19, opts.radiusTitle, { size: 6.5, anchor: 'middle', fill: MUTED }));

  for (const t of ticks) {
    parts.push(el('circle', { cx, cy, r: (t / rMax) * radius, fill: 'none', stroke: GRID, 'stroke-width': t === rMax ? 0.8 : 0.5 }));
  }
  for (let deg = 0; deg < 360; deg += 30) {
    const [x, y] = toXY(deg, rMax);
    parts.push(line(cx, cy, x, y, { stroke: GRID, 'stroke-width': 0.5 }));
    const a = (deg * Math.PI) / 180;
    const lx = cx + (radius + 9) * Math.cos(a);
    const ly = cy - (radius + 9) * Math.sin(a);
    const name = deg === 0 ? '0° +X' : deg === 90 ? '90° +Y' : `${deg}°`;
    const anchor = Math.abs(Math.cos(a)) < 0.2 ? 'middle' : Math.cos(a) > 0 ? 'start' : 'end';
    parts.push(text(deg === 0 ? lx - 6 : deg === 180 ? lx + 6 : lx, ly, name, { size: 6, anchor, middle: true, fill: MUTED }));
  }
  for (const t of ticks) {
    const [x, y] = toXY(TICK_DEG, t);
    parts.push(text(x + 1.5, y - 1.5, tickLabel(t, step), { size: 5.5, fill: MUTED }));
  }

  opts.series.forEach((s) => {
    if (s.signed) {
      for (const run of signedRuns(opts.directionsDeg, s.values, toXY)) {
        parts.push(
          el('path', {
            d: pathThrough(run.points),
            fill: 'none',
            stroke: s.color,
            'stroke-width': 1.3,
            'stroke-dasharray': run.positive ? undefined : NEGATIVE_DASH,
            'stroke-linejoin': 'round',
          }),
        );
      }
      for (const sign of [1, -1] as const) {
        const i = extremeIndex(s.values, sign);
        if (i < 0) continue;
        // Inside the lobe, just short of its tip: always clear space, never on a spoke label.
        const [x, y] = toXY(opts.directionsDeg[i], Math.abs(s.values[i]) * 0.78);
        parts.push(
          text(x, y, `${s.tag ?? ''}${sign > 0 ? '+' : '−'}`, { size: 7, bold: true, anchor: 'middle', middle: true, fill: s.color }),
        );
      }
    } else {
      const pts = opts.directionsDeg.map((d, i) => toXY(d, Math.abs(s.values[i] ?? 0)));
      parts.push(
        el('path', {
          d: pathThrough(pts, true),
          fill: 'none',
          stroke: s.color,
          'stroke-width': 1.3,
          'stroke-dasharray': s.dash,
          'stroke-linejoin': 'round',
        }),
      );
    }
  });

  for (const m of opts.markers ?? []) {
    const [x, y] = toXY(m.directionDeg, m.value);
    parts.push(el('circle', { cx: x, cy: y, r: 2.6, fill: '#ffffff', stroke: INK, 'stroke-width': 1 }));
    parts.push(el('circle', { cx: x, cy: y, r: 0.9, fill: INK }));
  }

  // Legend under the plot: a line sample in the series' style and its label.
  let ly = TITLE_H + plotSize + 6;
  const lx = 8;
  for (const s of opts.series) {
    if (s.signed) {
      parts.push(line(lx, ly, lx + 9, ly, { stroke: s.color, 'stroke-width': 1.3 }));
      parts.push(line(lx + 11, ly, lx + 20, ly, { stroke: s.color, 'stroke-width': 1.3, 'stroke-dasharray': NEGATIVE_DASH }));
      parts.push(text(lx + 24, ly, `${s.label} (solid +, dashed −)`, { size: 6.5, middle: true }));
    } else {
      parts.push(line(lx, ly, lx + 20, ly, { stroke: s.color, 'stroke-width': 1.3, 'stroke-dasharray': s.dash }));
      parts.push(text(lx + 24, ly, s.label, { size: 6.5, middle: true }));
    }
    ly += LEGEND_ROW;
  }
  for (const m of opts.markers ?? []) {
    parts.push(el('circle', { cx: lx + 10, cy: ly, r: 2.6, fill: '#ffffff', stroke: INK, 'stroke-width': 1 }));
    parts.push(el('circle', { cx: lx + 10, cy: ly, r: 0.9, fill: INK }));
    parts.push(text(lx + 24, ly, m.label, { size: 6.5, middle: true }));
    ly += LEGEND_ROW;
  }
  return svgDocument(w, h, parts);
}
