import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { renderSheet } from '../../../../server/sheet/renderSheet';
import { formatNumber } from '@/format';
import { designFor, engineOneResult, exampleSheetInput } from './fixtures/sheetInput';

// Rendering a sheet takes a second or two; on a busy shared machine several can queue up.
vi.setConfig({ testTimeout: 60_000, hookTimeout: 60_000 });

// poppler-utils (pdftotext, pdfinfo, pdffonts) reads the PDF the way a viewer would.
let dir: string;
beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'gw-sheet-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function poppler(tool: string, pdf: Buffer, ...args: string[]): string {
  const file = path.join(dir, `${tool}-${Math.random().toString(36).slice(2)}.pdf`);
  writeFileSync(file, pdf);
  return execFileSync(tool, [...args, file, ...(tool === 'pdftotext' ? ['-'] : [])], { encoding: 'utf8' });
}

function pageCount(pdf: Buffer): number {
  return Number(/Pages:\s+(\d+)/.exec(poppler('pdfinfo', pdf))?.[1]);
}

function mediaBoxes(pdf: Buffer): string[] {
  return [...new Set([...pdf.toString('latin1').matchAll(/\/MediaBox \[([^\]]*)\]/g)].map((m) => m[1].trim()))];
}

describe('renderSheet', () => {
  const input = exampleSheetInput();
  let a4: Buffer;
  let letter: Buffer;
  beforeAll(async () => {
    a4 = await renderSheet(input);
    letter = await renderSheet({ ...input, paper: 'LETTER' });
  });

  it('when rendered, then the bytes are a PDF', () => {
    expect(a4.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(a4.subarray(-6).toString('latin1')).toContain('%%EOF');
  });

  it('when the text is extracted, then it holds the design name, steps per mm, the cautions and the fingerprint', () => {
    // Act
    const text = poppler('pdftotext', a4, '-layout').replace(/[ \t]+/g, ' ');
    const flat = text.replace(/\s+/g, ' ');

    // Assert
    expect(text).toContain(input.designName);
    expect(text).toContain(`Steps per mm of belt ${input.result.drive.stepsPerMm.toFixed(3)} ${input.result.drive.stepsPerMm.toFixed(3)}`);
    expect(input.result.cautions.length).toBeGreaterThanOrEqual(4);
    for (const caution of input.result.cautions) {
      expect(flat).toContain(`${caution.title}.`);
      expect(flat).toContain(caution.text);
    }
    for (const phrase of ['Pinch points', 'Electrical supply', 'Stored energy', 'local codes', 'machine-safety rules', 'licensed']) {
      expect(flat).toContain(phrase);
    }
    expect(text).toContain(input.fingerprint);
    expect(text).toContain(input.approval.reviewerName);
    expect(text).toContain('2025-03-14 09:30 UTC');
  });

  it('when the text is extracted, then every belt has its cut length and teeth, every span its target frequency with its band, and the parking position is stated', () => {
    const flat = poppler('pdftotext', a4, '-layout').replace(/\s+/g, ' ');
    expect(input.result.belts.length).toBeGreaterThan(0);
    for (const belt of input.result.belts) {
      expect(flat).toContain(`${belt.label} ${formatNumber(belt.cutLengthMm)} ${belt.loopTeeth}`);
      for (const span of belt.spans) {
        // the band keeps tension within ±10 %: f·√0.9 … f·√1.1 (string law; engine pluckBandHz)
        const band = `${(span.targetFrequencyHz * Math.sqrt(0.9)).toFixed(1)} – ${(span.targetFrequencyHz * Math.sqrt(1.1)).toFixed(1)}`;
        expect(flat).toMatch(new RegExp(`(yes|no) ${span.targetFrequencyHz.toFixed(1)} ${band}`));
      }
    }
    const { xMm, yMm } = input.result.parking;
    expect(flat).toContain(`Park the carriage at X ${formatNumber(xMm)} mm, Y ${formatNumber(yMm)} mm`);
    expect(flat).toContain(`Set every span to ${formatNumber(input.inputs.pretensionN, 3)} N`);
  });

  it('when the text is extracted, then the limits along X, Y, the diagonal, the worst directions for acceleration and for speed and the lowest resonance are printed, and no internal check id', () => {
    const flat = poppler('pdftotext', a4, '-layout').replace(/\s+/g, ' ');
    const { axes } = input.result.envelope;
    const three = (v: number) => formatNumber(v, 3);
    expect(flat).toContain(
      `Along X 0 ${three(axes.x.accelMaxMPerS2)} ${three(axes.x.accelAtCruiseMPerS2)} ${three(axes.x.speedMaxMPerS * 1000)}`,
    );
    expect(flat).toContain(`Along Y 90 ${three(axes.y.accelMaxMPerS2)}`);
    expect(flat).toContain(`Along the diagonal 45 ${three(axes.diagonal.accelMaxMPerS2)}`);
    expect(flat).toContain(`Worst for acceleration ${axes.worst.directionDeg} ${three(axes.worst.accelMaxMPerS2)}`);
    // The worst speed is the lowest over all directions (docs/models/envelope.md §3): on this CoreXY the diagonal's.
    expect(flat).toContain(`Worst for speed 45 ${three(axes.diagonal.accelMaxMPerS2)}`);
    expect(flat).toMatch(new RegExp(`Worst for speed 45 \\S+ \\S+ ${three(axes.diagonal.speedMaxMPerS * 1000)}`));
    expect(flat).toContain(`${input.result.stiffness.min.frequencyHz.toFixed(1)} Hz`);
    for (const check of input.result.checks) if (check.subject) expect(flat).toContain(check.subject);
    // fix: #13 internal check ids stay off the sheet
    const ids = input.result.checks.map((c) => c.id).filter((id) => /[-:]/.test(id));
    expect(ids.length).toBeGreaterThan(3);
    for (const id of ids) expect(flat).not.toContain(id);
  });

  it('when the text is extracted, then the worst tight and slack sides with where, the tooth load, the microstep figures and the motor-model caveats are printed', () => {
    // Arrange
    const flat = poppler('pdftotext', a4, '-layout').replace(/\s+/g, ' ');
    const r = input.result;
    // Act / Assert
    for (const b of r.belts) {
      expect(flat).toContain(`${formatNumber(b.tension.worstTightN, 3)} / ${formatNumber(b.tension.tensileAllowableN, 3)}`);
      expect(flat).toContain(
        `X ${formatNumber(b.tension.worstSlackAt.xMm, 3)}, Y ${formatNumber(b.tension.worstSlackAt.yMm, 3)} mm, moving toward`,
      );
      expect(flat).toContain(`${formatNumber(b.tension.toothLoadN, 3)} / ${formatNumber(b.tension.toothAllowableN, 3)}`);
    }
    expect(flat).toContain(`Smallest pure X or pure Y move ${formatNumber(r.drive.microstep.axisMm * 1000)} µm`);
    expect(flat).toContain(`Smallest pure 45° diagonal move ${formatNumber(r.drive.microstep.diagonalMm * 1000)} µm`);
    expect(flat).toContain('One motor steps once, the other holds');
    expect(flat).toContain('mid-band resonance, iron loss and detent torque');
    expect(flat).toContain('measured torque–speed table');
  });

  it('when the sheet is printed in imperial units, then lengths, forces and accelerations read in inches, pound-force and in/s² (NIST SP 811 B.8)', async () => {
    // Act
    const flat = poppler('pdftotext', await renderSheet({ ...input, units: 'imperial' }), '-layout').replace(/\s+/g, ' ');
    // Assert
    const belt = input.result.belts[0];
    expect(flat).toContain('Units on this sheet Approved on CoreXY Imperial');
    expect(flat).toContain(`${belt.label} ${formatNumber(belt.cutLengthMm / 25.4)} ${belt.loopTeeth}`);
    expect(flat).toContain(`Set every span to ${formatNumber(input.inputs.pretensionN / 4.4482216152605, 3)} lbf`);
    expect(flat).toContain(`Steps per inch of belt ${(input.result.drive.stepsPerMm * 25.4).toFixed(2)}`);
    expect(flat).toContain('Accel. at rest [in/s²]');
    expect(flat).not.toMatch(/\[mm\]/);
  });

  it('when a reviewer approved over a failed check, then the justification is printed with the approval and above the checks', async () => {
    // Arrange
    const failing = { ...input.result, checks: input.result.checks.map((c, i) => (i === 0 ? { ...c, severity: 'fail' as const } : c)) };
    const justification = 'Torque use is higher on purpose; the stage only runs at half speed.';
    // Act
    const flat = poppler(
      'pdftotext',
      await renderSheet({ ...input, result: failing, approval: { ...input.approval, justification } }),
      '-layout',
    ).replace(/\s+/g, ' ');
    // Assert
    const failed = failing.checks.filter((c) => c.severity === 'fail').length;
    expect(flat).toContain(`Approved although ${failed} check${failed === 1 ? '' : 's'} failed`);
    expect(flat.split(justification).length - 1).toBe(2);
  });

  it('when every page is read, then each carries "Page X of Y" and the fingerprint in its footer', () => {
    const pages = pageCount(a4);
    expect(pages).toBeGreaterThanOrEqual(4);
    for (let p = 1; p <= pages; p += 1) {
      const text = poppler('pdftotext', a4, '-f', String(p), '-l', String(p));
      expect(text, `page ${p}`).toContain(`Page ${p} of ${pages}`);
      expect(text, `page ${p}`).toContain(input.fingerprint);
    }
  });

  it('when the cautions are looked for, then they are on page 1', () => {
    const first = poppler('pdftotext', a4, '-f', '1', '-l', '1').replace(/\s+/g, ' ');
    expect(first).toContain('CAUTIONS');
    expect(first).toContain('licensed practice');
  });

  it('when A4 and US Letter are rendered, then the page sizes are 595.28 × 841.89 and 612 × 792 points', () => {
    expect(mediaBoxes(a4)).toEqual(['0 0 595.28 841.89']);
    expect(mediaBoxes(letter)).toEqual(['0 0 612 792']);
    expect(poppler('pdfinfo', letter)).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
  });

  it('when fonts are listed, then only embedded Inter subsets are used (no substituted font)', () => {
    const rows = poppler('pdffonts', a4).trim().split('\n').slice(2);
    expect(rows.length).toBeGreaterThan(0);
    for (const row of rows) {
      expect(row).toMatch(/^[A-Z]{6}\+Inter-(Regular|Bold|Italic|BoldItalic)\s/);
      expect(row).toMatch(/\byes\s+yes\s+yes\b/);
    }
  });

  it('when the text is extracted, then no controller configuration syntax is printed', () => {
    const text = poppler('pdftotext', a4);
    expect(text).not.toMatch(/\b[GM]\d{1,3}\b/);
    expect(text).not.toMatch(/\b[a-z]+_[a-z_]+\b/);
  });

  it('when the same revision is rendered twice, then the bytes are identical', async () => {
    const again = await renderSheet(exampleSheetInput());
    expect(again.equals(a4)).toBe(true);
  });

  it.each(['hbot', 'cartesian'] as const)(
    'when the mechanism is %s, then the sheet renders with its own motor names and racking',
    async (mechanism) => {
      // Arrange
      const other = exampleSheetInput({}, designFor(mechanism));

      // Act
      const flat = poppler('pdftotext', await renderSheet(other), '-layout').replace(/\s+/g, ' ');

      // Assert
      expect(flat).toContain(other.designName);
      expect(flat).toContain(mechanism === 'cartesian' ? 'Motor X' : 'Motor A');
      expect(flat).toContain('Racking.');
      if (mechanism === 'hbot') expect(other.result.racking.momentPerNewtonM).toBeGreaterThan(0);
      if (mechanism === 'hbot') expect(flat).toContain(`${formatNumber(other.result.racking.peakMomentNm, 3)} N·m`);
    },
  );

  it.each([
    ['a fingerprint that is not SHA-256 hex', { fingerprint: 'abc' }, /fingerprint/],
    ['an unknown paper size', { paper: 'A3' as 'A4' }, /paper/],
    ['an approval date that is not a date', { approval: { reviewerName: 'R', approvedAt: 'soon', comment: '' } }, /approvedAt/],
    ['a revision number of zero', { revisionNumber: 0 }, /revisionNumber/],
    ['a mechanism that differs from the frozen result', { mechanism: 'hbot' as const }, /mechanism/],
    [
      'frozen inputs that the schema rejects',
      { inputs: { ...exampleSheetInput().inputs, driver: { microsteps: 3, supplyV: 24, currentRmsA: 1.2 } } },
      /driver\.microsteps/,
    ],
  ])('when given %s, then it rejects naming the field', async (_name, override, message) => {
    await expect(renderSheet(exampleSheetInput(override))).rejects.toThrow(message);
  });
});

describe('renderSheet with a result frozen by engine 1', () => {
  it('when a revision approved with engine 1 is rendered, then its figures print as approved and say which engine made them', async () => {
    // Arrange
    const old = exampleSheetInput({ result: engineOneResult() });
    // Act
    const pdf = await renderSheet(old);
    // Assert
    const flat = poppler('pdftotext', pdf, '-layout').replace(/\s+/g, ' ');
    expect(flat).toContain('1.0.0');
    expect(flat).toContain('Along X (engine 1.0.0) 6.25 µm');
    expect(flat).toContain('Tensions as approved with engine 1.0.0');
    const b = old.result.belts[0] as unknown as { tightSideN: number; allowableTensionN: number };
    expect(flat).toContain(`${b.tightSideN.toFixed(1)} / ${b.allowableTensionN.toFixed(0)}`);
  });
});
