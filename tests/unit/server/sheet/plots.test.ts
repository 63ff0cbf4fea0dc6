import { describe, expect, it } from 'vitest';
import { severityIcon, wordmarkGlyph } from '../../../../server/sheet/plots/glyphs';
import { heatmap } from '../../../../server/sheet/plots/heatmap';
import { lineChart } from '../../../../server/sheet/plots/lineChart';
import { polarPlot } from '../../../../server/sheet/plots/polar';
import { niceMax, niceTicks, tickLabel, viridis } from '../../../../server/sheet/plots/svg';

const DIRS = Array.from({ length: 360 }, (_, i) => i);
const texts = (svg: string): string[] => [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);

describe('niceTicks / niceMax / tickLabel', () => {
  it.each([
    [0, 97, 5, [0, 20, 40, 60, 80]],
    [0, 1.5, 4, [0, 0.5, 1, 1.5]],
    [45.4, 76.2, 5, [50, 55, 60, 65, 70, 75]],
  ])('when the range is %d..%d, then the ticks are round 1-2-5 steps', (min, max, count, expected) => {
    const ticks = niceTicks(min, max, count);
    expect(ticks.length).toBe(expected.length);
    ticks.forEach((t, i) => expect(t).toBeCloseTo(expected[i], 9));
  });

  it('when the largest value is 96.7, then the axis ends at 100', () => {
    expect(niceMax(96.7)).toBe(100);
  });

  it("when a label is negative or fractional, then it uses a true minus sign and the step's decimals", () => {
    expect(tickLabel(-1, 0.5)).toBe('\u22121.0');
    expect(tickLabel(0.25, 0.25)).toBe('0.25');
    expect(tickLabel(200, 100)).toBe('200');
  });
});

describe('viridis', () => {
  it("when asked for both ends, then it gives the colormap's first and last colours", () => {
    expect(viridis(0)).toBe('#440154');
    expect(viridis(1)).toBe('#fde725');
    expect(viridis(-3)).toBe('#440154');
  });
});

describe('polarPlot', () => {
  it('when a signed series changes sign, then negative runs are dashed, positive solid, and both lobes are labelled', () => {
    // Arrange: cos θ is positive on the right half, negative on the left.
    const values = DIRS.map((d) => Math.cos((d * Math.PI) / 180));

    // Act
    const svg = polarPlot({
      width: 200,
      title: 'T',
      radiusTitle: 'radius [-]',
      directionsDeg: DIRS,
      series: [{ label: 'Motor A', tag: 'A', values, color: '#0072B2', signed: true }],
    });

    // Assert
    const curves = [...svg.matchAll(/<path d="[^"]*" fill="none" stroke="#0072B2"([^>]*)\/>/g)].map((m) => m[1]);
    expect(curves.length).toBeGreaterThanOrEqual(2);
    expect(curves.some((attrs) => attrs.includes('stroke-dasharray'))).toBe(true);
    expect(curves.some((attrs) => !attrs.includes('stroke-dasharray'))).toBe(true);
    expect(texts(svg)).toEqual(expect.arrayContaining(['A+', 'A−', '0° +X', '90° +Y', 'radius [-]', 'Motor A (solid +, dashed −)']));
  });

  it('when a value of 1 lies at 0° on a 0..1 axis, then its point sits on the outer circle to the right', () => {
    const svg = polarPlot({
      width: 200,
      title: 'T',
      radiusTitle: 'r',
      directionsDeg: [0, 90, 180, 270],
      series: [{ label: 'S', values: [1, 0.5, 0.5, 0.5], color: '#000000' }],
      rMax: 1,
    });
    const outer = [
      ...svg.matchAll(/<circle cx="([\d.]+)" cy="([\d.]+)" r="([\d.]+)" fill="none" stroke="#d5d9e0" stroke-width="0.8"\/>/g),
    ][0];
    const [cx, , r] = outer.slice(1).map(Number);
    const first = /<path d="M([\d.]+) ([\d.]+)/.exec(svg.slice(svg.indexOf('stroke="#000000"') - 200));
    expect(first).not.toBeNull();
    expect(Number(first?.[1])).toBeCloseTo(cx + r, 1);
  });
});

describe('heatmap', () => {
  it('when the grid has one low corner, then that cell has the darkest colour, the highest the brightest, and the ring marks the low one', () => {
    // Arrange
    const xMm = [0, 100, 200];
    const yMm = [0, 100];
    const values = [
      [40, 50, 60],
      [55, 65, 80],
    ];

    // Act
    const svg = heatmap({
      width: 300,
      maxPlotHeight: 100,
      title: 'Map',
      xTitle: 'X [mm]',
      yTitle: 'Y [mm]',
      barTitle: 'f [Hz]',
      xMm,
      yMm,
      values,
      min: { value: 40, xMm: 0, yMm: 0, label: 'lowest 40 Hz' },
    });

    // Assert: one path per colour step; the lowest value is the darkest step and starts where the ring is.
    const fills = [...svg.matchAll(/<path d="(M[^"]*)" fill="(#[0-9a-f]{6})"\/>/g)].map((m) => ({ d: m[1], fill: m[2] }));
    expect(fills.length).toBe(6);
    const darkest = fills.find((f) => f.fill === '#440154');
    const brightest = fills.find((f) => f.fill === '#fde725');
    expect(darkest).toBeDefined();
    expect(brightest).toBeDefined();
    const ring = /<circle cx="([\d.]+)" cy="([\d.]+)" r="4.5"/.exec(svg);
    expect(Number(/^M([\d.]+) /.exec(darkest?.d ?? '')?.[1])).toBeCloseTo(Number(ring?.[1]), 1);
    expect(darkest?.d.match(/M/g)).toHaveLength(1);
    expect(texts(svg)).toEqual(expect.arrayContaining(['X [mm]', 'Y [mm]', 'f [Hz]', 'Marked: lowest 40 Hz']));
  });
});

describe('lineChart', () => {
  it('when drawn with points, then axis titles, legend labels and one marker per point appear and text is escaped', () => {
    const svg = lineChart({
      width: 240,
      height: 160,
      title: 'Torque <model>',
      xTitle: 'Motor speed [rev/s]',
      yTitle: 'Torque [N·m]',
      series: [{ label: 'Available', x: [0, 10, 20], y: [0.36, 0.3, 0], color: '#0072B2' }],
      points: [
        { x: 5, y: 0.2, label: 'Cruise', shape: 'square' },
        { x: 15, y: 0.1, label: 'Top', shape: 'diamond' },
      ],
    });
    expect(texts(svg)).toEqual(
      expect.arrayContaining(['Torque &lt;model&gt;', 'Motor speed [rev/s]', 'Torque [N·m]', 'Available', 'Cruise', 'Top']),
    );
    expect(svg).not.toContain('<model>');
  });
});

describe('glyphs', () => {
  it.each(['ok', 'warn', 'fail'] as const)('when drawing the %s severity, then it is a distinct shape', (severity) => {
    const svg = severityIcon(severity, 12);
    const shape = { ok: '<circle', warn: '<path', fail: '<rect' }[severity];
    expect(svg.indexOf(shape)).toBe(svg.indexOf('>') + 1);
  });

  it('when drawing the wordmark glyph, then it is a square SVG of the asked size', () => {
    expect(wordmarkGlyph(22)).toMatch(/^<svg [^>]*width="22" height="22"/);
  });
});

describe('heatmap on a fine grid', () => {
  it('when the map is 101 × 101 points, then cells merge into at most one path per colour step', () => {
    const n = 101;
    const grid = Array.from({ length: n }, (_, i) => i * 3);
    const values = grid.map((y) => grid.map((x) => 60 + 0.05 * x + 0.1 * y));
    const svg = heatmap({
      width: 400,
      maxPlotHeight: 300,
      title: 'Map',
      xTitle: 'X [mm]',
      yTitle: 'Y [mm]',
      barTitle: 'f [Hz]',
      xMm: grid,
      yMm: grid,
      values,
      min: { value: 60, xMm: 0, yMm: 0, label: 'lowest' },
    });
    const cellPaths = [...svg.matchAll(/<path d="M[^"]*" fill="#[0-9a-f]{6}"\/>/g)];
    expect(cellPaths.length).toBeGreaterThan(10);
    expect(cellPaths.length).toBeLessThanOrEqual(48);
  });
});
