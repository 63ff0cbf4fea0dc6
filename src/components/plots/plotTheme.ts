import type { PlotLayout } from 'plotly.js-dist-min';

/**
 * Colours and fonts for plots, read from the theme's CSS variables so plots follow the light/dark theme.
 * Series colours are the Okabe–Ito set (--gw-plot-1 … 8), which stays distinguishable for the common
 * colour-vision deficiencies; heat maps use viridis, which is perceptually uniform and colour-blind safe.
 */

/** Fallback Okabe–Ito colours (when CSS variables are unavailable, e.g. in tests). */
const OKABE_ITO = ['#0072b2', '#e69f00', '#009e73', '#d55e00', '#56b4e9', '#cc79a7', '#f0e442', '#000000'];

/** Colours a plot needs. */
export interface PlotColours {
  series: string[];
  text: string;
  muted: string;
  grid: string;
  panel: string;
  font: string;
  /** Marks of points that fail a check. */
  fail: string;
}

function cssVar(name: string, fallback: string): string {
  if (typeof document === 'undefined' || typeof getComputedStyle !== 'function') return fallback;
  const value = getComputedStyle(document.documentElement).getPropertyValue(name).trim();
  return value || fallback;
}

let cached: { theme: string; colours: PlotColours } | null = null;

/**
 * Reads the current theme's plot colours. Kept per theme: reading CSS variables forces a style recalculation,
 * and every plot asks for its colours again on each new result while someone types.
 */
export function plotColours(): PlotColours {
  const theme = typeof document === 'undefined' ? '' : document.documentElement.className;
  if (cached && cached.theme === theme) return cached.colours;
  const colours = readColours();
  // Without a document (tests) nothing is read, so nothing needs keeping.
  if (typeof document !== 'undefined' && typeof getComputedStyle === 'function') cached = { theme, colours };
  return colours;
}

function readColours(): PlotColours {
  return {
    series: OKABE_ITO.map((c, i) => cssVar(`--gw-plot-${i + 1}`, c)),
    text: cssVar('--gw-text', '#1d2624'),
    muted: cssVar('--gw-text-muted', '#5d6b68'),
    grid: cssVar('--gw-border', '#dfe3dd'),
    panel: cssVar('--gw-bg-panel', '#ffffff'),
    font: cssVar('--gw-font', 'Inter, system-ui, sans-serif'),
    fail: cssVar('--gw-fail-text', '#b42a24'),
  };
}

/** Named series colours, so the same thing has the same colour on every tab. */
export const SERIES = {
  motorA: 0,
  motorB: 1,
  atRest: 2,
  atCruise: 3,
  third: 4,
  fourth: 5,
} as const;

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Merges b into a (objects deeply, everything else replaced). */
function merge(a: Record<string, unknown>, b: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...a };
  for (const [k, v] of Object.entries(b)) out[k] = isRecord(v) && isRecord(out[k]) ? merge(out[k] as Record<string, unknown>, v) : v;
  return out;
}

/**
 * The theme's layout defaults merged under a plot's own layout: fonts, transparent backgrounds, grid colours
 * on every cartesian axis and polar subplot the layout names.
 * @param layout - the plot's layout
 * @param c - colours of the current theme
 */
export function themedLayout(layout: PlotLayout, c: PlotColours): PlotLayout {
  const axis = {
    gridcolor: c.grid,
    linecolor: c.grid,
    zerolinecolor: c.grid,
    tickfont: { color: c.muted },
    title: { font: { color: c.text, size: 12 } },
    automargin: true,
  };
  const polar = {
    bgcolor: 'rgba(0,0,0,0)',
    radialaxis: {
      gridcolor: c.grid,
      linecolor: c.grid,
      tickfont: { color: c.muted, size: 10 },
      title: { font: { color: c.text, size: 11 } },
    },
    angularaxis: {
      gridcolor: c.grid,
      linecolor: c.grid,
      tickfont: { color: c.muted, size: 10 },
      direction: 'counterclockwise',
      rotation: 0,
    },
  };
  let base: Record<string, unknown> = {
    font: { family: c.font, color: c.text, size: 12 },
    paper_bgcolor: 'rgba(0,0,0,0)',
    plot_bgcolor: 'rgba(0,0,0,0)',
    margin: { l: 56, r: 20, t: 28, b: 48 },
    legend: { orientation: 'h', x: 0, y: -0.18, font: { size: 12 } },
    hoverlabel: { font: { family: c.font } },
    colorway: c.series,
  };
  for (const key of Object.keys(layout)) {
    if (/^[xy]axis\d*$/.test(key)) base = merge(base, { [key]: axis });
    if (/^polar\d*$/.test(key)) base = merge(base, { [key]: polar });
  }
  if (!Object.keys(layout).some((k) => /^polar\d*$/.test(k)) && !('xaxis' in layout)) base = merge(base, { xaxis: axis, yaxis: axis });
  return merge(base, layout as Record<string, unknown>);
}
