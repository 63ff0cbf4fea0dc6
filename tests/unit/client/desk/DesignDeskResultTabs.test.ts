import { beforeEach, describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { defaultDesign, evaluateDesign, type DesignResult } from '@/engine';
import DesignDeskSummaryTab from '@/views/desk/DesignDeskSummaryTab.vue';
import DesignDeskTensionTab from '@/views/desk/DesignDeskTensionTab.vue';

/** A current result reshaped as engine 1 froze it (see tests/unit/server/sheet/fixtures/sheetInput.ts). */
function engineOne(r: DesignResult): DesignResult {
  const old = JSON.parse(JSON.stringify(r)) as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
  old.engineVersion = '1.0.0';
  old.drive.microstepMm = { x: 0.00625, y: 0.00625, diagonal: 0.00884 };
  delete old.drive.microstep;
  for (const b of old.belts) {
    b.tightSideN = 53;
    b.slackSideN = 27;
    b.allowableTensionN = 200;
    delete b.tension;
  }
  return old as DesignResult;
}

const stubs = { BasePlot: { props: ['series', 'testId'], template: '<div :data-test="testId" :data-series="JSON.stringify(series)" />' } };

describe('DesignDeskTensionTab', () => {
  beforeEach(() => setActivePinia(createPinia()));

  it('when a crossed-belt result is shown, then each belt has its worst tight and slack side with where, the tooth load and both maps', () => {
    // Arrange
    const result = evaluateDesign({ ...defaultDesign('corexy'), map: { points: 5 } });
    // Act
    const w = mount(DesignDeskTensionTab, { props: { result, pretensionN: 40 }, global: { stubs } });
    // Assert
    for (const b of result.belts) {
      const worst = w.find(`[data-test="tension-worst-${b.id}"]`).text();
      expect(worst).toContain('Worst tight side');
      expect(worst).toContain(`toward ${Math.round(b.tension.worstSlackAt.directionDeg)}°`);
      expect(w.find(`[data-test="tension-tooth-${b.id}"]`).text()).toContain('typical value');
      const tight = JSON.parse(w.find(`[data-test="tension-map-tight-${b.id}"]`).attributes('data-series')!);
      expect(tight.tensionN).toEqual(b.tension.tightMapN);
      const slack = JSON.parse(w.find(`[data-test="tension-map-slack-${b.id}"]`).attributes('data-series')!);
      expect(slack.worst.n).toBe(b.tension.worstSlackN);
    }
  });

  it('when a revision frozen by engine 1 is shown, then its old figures appear as approved with the engine named', () => {
    // Arrange
    const result = engineOne(evaluateDesign({ ...defaultDesign('corexy'), map: { points: 5 } }));
    // Act
    const w = mount(DesignDeskTensionTab, { props: { result, pretensionN: 40 }, global: { stubs } });
    // Assert
    const text = w.text();
    expect(text).toContain('As approved with engine 1.0.0');
    expect(text).toContain('53');
    expect(w.find('[data-test^="tension-map"]').exists()).toBe(false);
  });
});

describe('DesignDeskSummaryTab', () => {
  beforeEach(() => setActivePinia(createPinia()));

  it('when a result is shown, then the three microstep figures appear by name', () => {
    // Arrange
    const result = evaluateDesign({ ...defaultDesign('corexy'), map: { points: 5 } });
    // Act
    const w = mount(DesignDeskSummaryTab, { props: { result }, global: { stubs: { ...stubs, DesignDeskLayoutSketch: true } } });
    // Assert
    const drive = w.find('[data-test="summary-drive"]').text();
    expect(drive).toContain('Carriage move, one motor one microstep');
    expect(drive).toContain('Smallest pure X or Y move');
    expect(drive).toContain('Smallest pure 45° diagonal move');
    expect(w.find('[data-test="summary-microstep-axis"]').text()).toMatch(/12\.5\s*µm|0\.0125/);
  });

  it('when an engine 1 result is shown, then its one-motor figures are labelled with that engine', () => {
    // Arrange
    const result = engineOne(evaluateDesign({ ...defaultDesign('corexy'), map: { points: 5 } }));
    // Act
    const w = mount(DesignDeskSummaryTab, { props: { result }, global: { stubs: { ...stubs, DesignDeskLayoutSketch: true } } });
    // Assert
    expect(w.find('[data-test="summary-drive"]').text()).toContain('engine 1.0.0');
  });
});
