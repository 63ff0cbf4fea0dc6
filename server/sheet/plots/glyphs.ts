import type { Severity } from '../types';
import { el, INK, PALETTE, pathThrough, svgDocument } from './svg';

/**
 * Our wordmark glyph: a frame with a gantry beam across it and a carriage riding the beam,
 * the belt drawn as a thin loop round the frame corners. Original drawing.
 */
export function wordmarkGlyph(size: number): string {
  const s = size / 32;
  const p = (x: number, y: number): [number, number] => [x * s, y * s];
  const body = [
    el('rect', { x: 2 * s, y: 2 * s, width: 28 * s, height: 28 * s, rx: 4 * s, fill: INK }),
    // belt loop
    el('path', {
      d: pathThrough([p(7, 7), p(25, 7), p(25, 25), p(7, 25)], true),
      fill: 'none',
      stroke: PALETTE.sky,
      'stroke-width': 1.1 * s,
    }),
    // corner pulleys
    ...[p(7, 7), p(25, 7), p(25, 25), p(7, 25)].map(([x, y]) => el('circle', { cx: x, cy: y, r: 2.1 * s, fill: '#ffffff' })),
    // gantry beam
    el('rect', { x: 5 * s, y: 14.6 * s, width: 22 * s, height: 2.8 * s, fill: '#ffffff' }),
    // carriage
    el('rect', { x: 13.5 * s, y: 11.5 * s, width: 7 * s, height: 9 * s, rx: 1 * s, fill: PALETTE.orange }),
    el('circle', { cx: 17 * s, cy: 16 * s, r: 1.3 * s, fill: INK }),
  ];
  return svgDocument(size, size, body);
}

/** Colour of a severity; the shape and the word carry the same meaning for readers who cannot tell colours apart. */
export const SEVERITY_COLOR: Record<Severity, string> = {
  ok: PALETTE.green,
  warn: PALETTE.orange,
  fail: PALETTE.vermillion,
};

/** The word printed beside a severity shape. */
export const SEVERITY_WORD: Record<Severity, string> = { ok: 'OK', warn: 'WARNING', fail: 'FAIL' };

/** Severity shape: circle with a tick (ok), triangle with a bar and dot (warn), square with a cross (fail). */
export function severityIcon(severity: Severity, size: number): string {
  const s = size / 12;
  const p = (x: number, y: number): [number, number] => [x * s, y * s];
  const color = SEVERITY_COLOR[severity];
  let body: string[];
  if (severity === 'ok') {
    body = [
      el('circle', { cx: 6 * s, cy: 6 * s, r: 5.5 * s, fill: color }),
      el('path', {
        d: pathThrough([p(3.3, 6.2), p(5.2, 8.1), p(8.8, 4.2)]),
        fill: 'none',
        stroke: '#ffffff',
        'stroke-width': 1.5 * s,
        'stroke-linecap': 'round',
        'stroke-linejoin': 'round',
      }),
    ];
  } else if (severity === 'warn') {
    body = [
      el('path', {
        d: pathThrough([p(6, 0.6), p(11.6, 11), p(0.4, 11)], true),
        fill: color,
        stroke: color,
        'stroke-width': 0.6 * s,
        'stroke-linejoin': 'round',
      }),
      el('rect', { x: 5.3 * s, y: 4 * s, width: 1.4 * s, height: 3.9 * s, fill: INK }),
      el('rect', { x: 5.3 * s, y: 8.7 * s, width: 1.4 * s, height: 1.4 * s, fill: INK }),
    ];
  } else {
    body = [
      el('rect', { x: 0.7 * s, y: 0.7 * s, width: 10.6 * s, height: 10.6 * s, fill: color }),
      el('path', {
        d: `${pathThrough([p(3.5, 3.5), p(8.5, 8.5)])} ${pathThrough([p(8.5, 3.5), p(3.5, 8.5)])}`,
        fill: 'none',
        stroke: '#ffffff',
        'stroke-width': 1.6 * s,
        'stroke-linecap': 'round',
      }),
    ];
  }
  return svgDocument(size, size, body);
}

/** Caution sign: a black-edged yellow triangle with an exclamation mark. */
export function cautionIcon(size: number): string {
  const s = size / 24;
  const p = (x: number, y: number): [number, number] => [x * s, y * s];
  return svgDocument(size, size, [
    el('path', {
      d: pathThrough([p(12, 1.5), p(23, 21.5), p(1, 21.5)], true),
      fill: PALETTE.yellow,
      stroke: INK,
      'stroke-width': 1.6 * s,
      'stroke-linejoin': 'round',
    }),
    el('rect', { x: 10.8 * s, y: 7.5 * s, width: 2.4 * s, height: 7.5 * s, fill: INK }),
    el('rect', { x: 10.8 * s, y: 16.6 * s, width: 2.4 * s, height: 2.4 * s, fill: INK }),
  ]);
}
