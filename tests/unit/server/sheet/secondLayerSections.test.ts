import { describe, expect, it } from 'vitest';
import { formatNumber } from '@/format';
import { buildSheetDoc } from '../../../../server/sheet/renderSheet';
import { docChars } from './docText';
import { designFor, exampleDesign, exampleSheetInput } from './fixtures/sheetInput';

/** Every character the sheet draws outside its header and footer, joined (SVG texts included). */
function sheetText(input: Parameters<typeof buildSheetDoc>[0]): string {
  return docChars(buildSheetDoc(input))
    .filter((c) => !c.where.startsWith('header') && !c.where.startsWith('footer'))
    .map((c) => c.char)
    .join('');
}

const JOB = {
  points: [
    { xMm: 10, yMm: 10, dwellS: 0.2 },
    { xMm: 150, yMm: 40, dwellS: 0.2 },
    { xMm: 60, yMm: 120, dwellS: 0 },
  ],
};

describe('secondLayerSection', () => {
  it('when a revision carries the second layer, then the sheet prints the error budget, the modes, the shapers and the drive', () => {
    // Arrange
    const input = exampleSheetInput();
    const r = input.result;
    // Act
    const text = sheetText(input);
    // Assert
    expect(text).toContain('Positioning error, modes and the drive');
    expect(text).toContain('Positioning-error budget');
    // The sheet prints through the app's formatting layer: µm and 3 significant figures in metric.
    expect(text).toContain(`Total (worst case)${formatNumber(r.errorBudget.worst.totalMm * 1000, 3)}`);
    for (const m of r.modes) expect(text).toContain(m.label);
    expect(text).toContain(`add ${formatNumber(r.shaping.zvDurationS * 1000, 3)} ms (ZV)`);
    expect(text).toContain('Supply: at least');
    expect(text).not.toContain('Job timing');
  });

  it('when the H loop leaves yaw to the guides, then the sheet says so', () => {
    const text = sheetText(exampleSheetInput({}, designFor('hbot')));
    expect(text).toContain('Only the Y guides keep the gantry from turning');
  });

  it('when a revision was frozen by an engine without the second layer, then those pages are left out and the rest still prints', () => {
    // Arrange: the stored result of an older engine has no second-layer sections
    const input = exampleSheetInput();
    const { errorBudget: _e, modes: _m, job: _j, ...older } = input.result;
    // Act
    const text = sheetText({ ...input, result: older as typeof input.result });
    // Assert
    expect(text).not.toContain('Positioning-error budget');
    expect(text).toContain('Parts to order');
  });
});

describe('jobSection', () => {
  it('when the revision has a job, then its page prints the cycle time, the path and the slowest moves', () => {
    // Arrange
    const design = { ...exampleDesign, job: JOB };
    const input = exampleSheetInput({}, design);
    const job = input.result.job!;
    // Act
    const text = sheetText(input);
    // Assert
    expect(text).toContain('Job timing');
    expect(text).toContain('Job path over the travel');
    expect(text).toContain(`for ${JOB.points.length} points`);
    expect(text).toContain('Slowest moves');
    const slowest = job.moves[job.slowest[0]];
    expect(text).toContain(`${slowest.fromIndex + 1} to ${slowest.toIndex + 1}`);
  });
});
