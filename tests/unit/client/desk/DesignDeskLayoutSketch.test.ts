import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { defaultDesign, evaluateDesign, type LayoutDrawing, type Mechanism } from '@/engine';
import DesignDeskLayoutSketch from '@/views/desk/DesignDeskLayoutSketch.vue';

function sketch(mech: Mechanism, edit?: (l: LayoutDrawing) => LayoutDrawing) {
  const layout = evaluateDesign(defaultDesign(mech)).layout;
  return mount(DesignDeskLayoutSketch, { props: { layout: edit ? edit(layout) : layout } });
}

/** Boxes of the drawn labels in SVG units, estimated from their text and font size as the placer does. */
function labelBoxes(wrapper: ReturnType<typeof sketch>): { text: string; x0: number; x1: number; y0: number; y1: number }[] {
  return wrapper.findAll('text.sketch__label').map((t) => {
    const x = Number(t.attributes('x'));
    const y = Number(t.attributes('y'));
    const size = Number(t.attributes('font-size'));
    const w = (t.text().length * 0.62 + 0.3) * size;
    return { text: t.text(), x0: x - w / 2, x1: x + w / 2, y0: y - size * 0.95, y1: y + size * 0.2 };
  });
}

describe('DesignDeskLayoutSketch', () => {
  it('when a crossed-belt layout is drawn, then every pulley carries its span-table name and stacked idlers share one mark', () => {
    // Arrange + Act
    const wrapper = sketch('corexy');
    // Assert
    const names = wrapper.findAll('text.sketch__label').map((t) => t.text());
    expect(names.sort()).toEqual(['A1', 'A2', 'A3/B4', 'A4/B3', 'A5', 'B1', 'B2', 'B5']);
    expect(wrapper.find('[data-test="sketch-pulley-A3/B4"] .sketch__stack').exists()).toBe(true);
  });

  it('when a crossed-belt layout is drawn, then both motor corners are drawn as motors, not idlers', () => {
    const wrapper = sketch('corexy');
    expect(wrapper.findAll('[data-test="sketch-motor"]')).toHaveLength(2);
    for (const name of ['A2', 'B2'])
      expect(wrapper.find(`[data-test="sketch-pulley-${name}"] circle`).classes()).toContain('sketch__drive');
  });

  it('when two levels are drawn, then the upper-level belt is dashed and the legend names each belt with its level', () => {
    const wrapper = sketch('corexy');
    expect(wrapper.find('[data-test="sketch-belt-A"] line').attributes('stroke-dasharray')).toBeUndefined();
    expect(wrapper.find('[data-test="sketch-belt-B"] line').attributes('stroke-dasharray')).toBeTruthy();
    expect(wrapper.findAll('[data-test="sketch-legend-belt"]').map((s) => s.text())).toEqual([
      'belt A — lower level',
      'belt B — upper level',
    ]);
  });

  it.each(['corexy', 'hbot', 'cartesian'] as const)('when the %s layout is drawn, then no two labels cover each other', (mech) => {
    const boxes = labelBoxes(sketch(mech));
    expect(boxes.length).toBeGreaterThan(1);
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i];
        const b = boxes[j];
        const apart = a.x1 <= b.x0 || b.x1 <= a.x0 || a.y1 <= b.y0 || b.y1 <= a.y0;
        expect(apart, `${a.text} and ${b.text}`).toBe(true);
      }
  });

  it('when a cartesian layout is drawn, then its upright pulleys are drawn edge-on', () => {
    const wrapper = sketch('cartesian');
    expect(wrapper.find('[data-test="sketch-pulley-YL1"] rect').exists()).toBe(true);
    expect(wrapper.find('[data-test="sketch-pulley-X2"] rect').exists()).toBe(true);
  });

  it('when a stored result of engine 1.0 (no tags or levels) is drawn, then it still draws, naming the motors', () => {
    const wrapper = sketch('corexy', (l) => ({
      ...l,
      levels: undefined,
      flangeMm: undefined,
      beltWidthMm: undefined,
      parts: l.parts.map(({ tag: _t, level: _l, axis: _a, stackedWith: _s, zMm: _z, ...p }) => p),
      belts: l.belts.map(({ level: _l, plane: _p, label: _b, ...b }) => b),
    }));
    expect(
      wrapper
        .findAll('text.sketch__label')
        .map((t) => t.text())
        .sort(),
    ).toEqual(['A', 'B']);
  });
});
