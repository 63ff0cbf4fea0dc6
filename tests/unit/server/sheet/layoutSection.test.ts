import { describe, expect, it } from 'vitest';
import { buildSheetDoc } from '../../../../server/sheet/renderSheet';
import { beltPathSvg, layoutPlanSvg, originPlanSvg } from '../../../../server/sheet/plots/layoutPlan';
import { docChars } from './docText';
import { designFor, exampleSheetInput } from './fixtures/sheetInput';

/** The texts of an SVG string, in order. */
function svgTexts(svg: string): string[] {
  return [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
}

describe('layoutSection', () => {
  it('when the crossed-belt sheet is laid out, then it has the layout plan, one plan per belt and the origin plan', () => {
    // Arrange
    const doc = buildSheetDoc(exampleSheetInput());
    // Act
    const text = docChars(doc)
      .map((c) => c.char)
      .join('');
    // Assert
    for (const heading of ['Belt layout', 'Belt paths', 'Origin and parking position', 'belt A, lower level', 'belt B, upper level']) {
      expect(text).toContain(heading);
    }
  });

  it('when the crossed-belt plan is drawn, then every pulley carries the name the span table uses', () => {
    const input = exampleSheetInput();
    const dr = input.result.layout;
    const texts = svgTexts(layoutPlanSvg(dr, 320, 300));
    expect(texts.sort()).toEqual(['A1', 'A2', 'A3/B4', 'A4/B3', 'A5', 'B1', 'B2', 'B5']);
    // The span table's labels start with the same names.
    const spanNames = new Set(input.result.belts.flatMap((b) => b.spans.flatMap((s) => s.label.match(/\b[AB]\d\b/g) ?? [])));
    for (const t of texts) for (const n of t.split('/')) expect(spanNames.has(n)).toBe(true);
  });

  it('when one belt is drawn alone, then only its pulleys are named', () => {
    const dr = exampleSheetInput().result.layout;
    expect(svgTexts(beltPathSvg(dr, 'B', 200, 190)).sort()).toEqual(['B1', 'B2', 'B3', 'B4', 'B5']);
  });

  it('when an upright cartesian loop is drawn, then it is drawn from the side with its two pulleys named', () => {
    const dr = exampleSheetInput({}, designFor('cartesian')).result.layout;
    const svg = beltPathSvg(dr, 'YL', 200, 190);
    expect(svgTexts(svg)).toEqual(expect.arrayContaining(['YL1', 'YL2', 'front', 'back']));
    expect(svg.match(/<ellipse/g)).toHaveLength(2);
  });

  it('when the origin plan is drawn, then it marks the origin, both axes and the parking position in travel coordinates', () => {
    const input = exampleSheetInput();
    const r = input.result;
    const texts = svgTexts(originPlanSvg(r.layout, r.travel, r.parking, 240, 200));
    expect(texts).toEqual(
      expect.arrayContaining(['+X', '+Y', 'origin (0, 0)', `parking: X ${r.parking.xMm.toFixed(1)}, Y ${r.parking.yMm.toFixed(1)} mm`]),
    );
  });

  it('when a result of engine 1.0 without names is laid out, then the sheet still renders the plan and says why there is no more', () => {
    const input = exampleSheetInput();
    const old = {
      ...input.result,
      layout: {
        ...input.result.layout,
        levels: undefined,
        parts: input.result.layout.parts.map(({ tag: _t, level: _l, axis: _a, stackedWith: _s, zMm: _z, ...p }) => p),
        belts: input.result.layout.belts.map(({ level: _l, plane: _p, label: _b, elevation: _e, ...b }) => b),
      },
    };
    const text = docChars(buildSheetDoc({ ...input, result: old }))
      .map((c) => c.char)
      .join('');
    expect(text).toContain('Belt layout');
    expect(text).toContain('without belt levels or pulley names');
    expect(text).not.toContain('Belt paths');
  });
});
