/** Attribute values of one SVG element; undefined attributes are left out. */
export type Attrs = Record<string, string | number | undefined>;

/**
 * Okabe–Ito palette (Okabe & Ito, "Color Universal Design", 2008): told apart under the common
 * colour-vision deficiencies. Lines also differ by dash pattern and direct labels, never by colour alone.
 */
export const PALETTE = {
  black: '#000000',
  orange: '#E69F00',
  sky: '#56B4E9',
  green: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  purple: '#CC79A7',
} as const;

export const INK = '#1d2430';
export const GRID = '#d5d9e0';
export const MUTED = '#5b6472';
/** SVG texts name the family registered with pdfmake; the glyph test reads every text back. */
export const SVG_FONT = 'Inter';

/** Escape text for SVG content and attribute values. */
export function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function num(value: number): string {
  return String(Math.round(value * 100) / 100);
}

function attrText(attrs: Attrs): string {
  return Object.entries(attrs)
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => ` ${k}="${typeof v === 'number' ? num(v) : escapeXml(v as string)}"`)
    .join('');
}

/** One element; children are already-built SVG strings. */
export function el(tag: string, attrs: Attrs, children: string | string[] = ''): string {
  const body = Array.isArray(children) ? children.join('') : children;
  return body ? `<${tag}${attrText(attrs)}>${body}</${tag}>` : `<${tag}${attrText(attrs)}/>`;
}

export interface TextOptions {
  size?: number;
  anchor?: 'start' | 'middle' | 'end';
  bold?: boolean;
  fill?: string;
  rotate?: number;
  /** Shift the baseline so the text is vertically centred on y. */
  middle?: boolean;
}

/** A text element in the sheet font; `middle` centres it vertically (svg-to-pdfkit ignores dominant-baseline). */
export function text(x: number, y: number, content: string, opts: TextOptions = {}): string {
  const size = opts.size ?? 7;
  const yy = opts.middle ? y + size * 0.35 : y;
  return el(
    'text',
    {
      x,
      y: yy,
      'font-family': SVG_FONT,
      'font-size': size,
      'font-weight': opts.bold ? 'bold' : undefined,
      'text-anchor': opts.anchor ?? 'start',
      fill: opts.fill ?? INK,
      transform: opts.rotate ? `rotate(${opts.rotate} ${num(x)} ${num(y)})` : undefined,
    },
    escapeXml(content),
  );
}

/** Straight line. */
export function line(x1: number, y1: number, x2: number, y2: number, attrs: Attrs = {}): string {
  return el('line', { x1, y1, x2, y2, stroke: INK, 'stroke-width': 0.6, ...attrs });
}

/** Path through points; `closed` joins the last point to the first. */
export function pathThrough(points: readonly [number, number][], closed = false): string {
  if (points.length === 0) return '';
  const parts = points.map(([x, y], i) => `${i === 0 ? 'M' : 'L'}${num(x)} ${num(y)}`);
  return parts.join(' ') + (closed ? ' Z' : '');
}

/** A whole SVG document of the given size in PDF points. */
export function svgDocument(width: number, height: number, body: string | string[]): string {
  return el('svg', { xmlns: 'http://www.w3.org/2000/svg', width, height, viewBox: `0 0 ${num(width)} ${num(height)}` }, body);
}

/** About `count` round tick values covering [min, max] (1-2-5 steps). */
export function niceTicks(min: number, max: number, count = 5): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return [0];
  if (max <= min) return [min];
  const raw = (max - min) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  // The finest round step that does not give many more ticks than asked for.
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => (max - min) / s <= count + 1.5) ?? 10 * mag;
  const first = Math.ceil(min / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = first; v <= max + step * 1e-9; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return ticks;
}

/** Upper end of a nice axis that holds `max`. */
export function niceMax(max: number, count = 5): number {
  if (!(max > 0)) return 1;
  const ticks = niceTicks(0, max, count);
  const last = ticks[ticks.length - 1];
  if (last >= max - 1e-12) return last;
  const step = ticks.length > 1 ? ticks[1] - ticks[0] : last;
  return last + step;
}

/** Tick label with as many decimals as the tick step needs; minus sign as U+2212. */
export function tickLabel(value: number, step: number): string {
  let decimals = step > 0 ? Math.max(0, -Math.floor(Math.log10(step))) : 0;
  while (decimals < 6 && Math.abs(step * 10 ** decimals - Math.round(step * 10 ** decimals)) > 1e-6) decimals += 1;
  const s = (Math.abs(value) < step * 1e-6 ? 0 : value).toFixed(decimals);
  return s.replace('-', '\u2212');
}

// Viridis (perceptually uniform, readable in greyscale and with colour-vision deficiencies): nine stops of
// the matplotlib colormap, interpolated linearly in RGB.
const VIRIDIS: readonly [number, number, number][] = [
  [68, 1, 84],
  [71, 44, 122],
  [59, 81, 139],
  [44, 113, 142],
  [33, 144, 141],
  [39, 173, 129],
  [92, 200, 99],
  [170, 220, 50],
  [253, 231, 37],
];

/** Viridis colour for t in [0, 1] as #rrggbb. */
export function viridis(t: number): string {
  const clamped = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0));
  const pos = clamped * (VIRIDIS.length - 1);
  const i = Math.min(VIRIDIS.length - 2, Math.floor(pos));
  const f = pos - i;
  const rgb = VIRIDIS[i].map((c, k) => Math.round(c + (VIRIDIS[i + 1][k] - c) * f));
  return '#' + rgb.map((c) => c.toString(16).padStart(2, '0')).join('');
}
