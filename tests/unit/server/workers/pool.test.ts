import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { defaultDesign, evaluateValidDesign, parseDesign, type DesignInput } from '@/engine';
import { getConfig } from '../../../../server/config';
import { AppError } from '../../../../server/errors';
import { calcJson, closePools, freezeInPool, getEnginePool, renderSheetsInPool } from '../../../../server/workers/pool';
import { freezeDesign } from '../../../../server/services/freezeRevision';
import { pickSections, RESULT_SECTIONS } from '../../../../server/workers/sections';

process.env.DB_PASSWORD ??= 'unit-test-password';
process.env.JWT_SECRET ??= 'Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw';

afterAll(() => closePools());

const overJson = <T>(value: T): unknown => JSON.parse(JSON.stringify(value));
const demo = (): DesignInput => parseDesign({ ...defaultDesign('corexy'), name: 'Pool test stage' });
const bytes = (body: unknown): Uint8Array => new Uint8Array(Buffer.from(JSON.stringify(body)));
/** Niceness of a process or thread from /proc/<path>/stat (the 19th field). */
const niceOf = (procPath: string): number => {
  try {
    return Number(fs.readFileSync(`/proc/${procPath}/stat`, 'utf8').split(') ')[1].split(' ')[16]);
  } catch {
    return Number.NaN; // a thread that ended while being read
  }
};

describe('engine worker pool', () => {
  it('when a design is calculated in the pool (a thread that loads TypeScript through entry.mjs), then the bytes are the JSON of the in-thread result', async () => {
    // Arrange
    const design = demo();

    // Act
    const answer = await calcJson({ kind: 'result', body: bytes({ design }) });

    // Assert
    expect(JSON.parse(answer.toString('utf8'))).toEqual(overJson(evaluateValidDesign(design)));
    expect(getEnginePool().threads.length).toBeGreaterThanOrEqual(1);
  });

  it('when sections are named, then only those sections and the identification come back', async () => {
    const design = demo();

    const answer = JSON.parse(
      (await calcJson({ kind: 'result', body: bytes({ design, sections: ['drive', 'checks'] }) })).toString('utf8'),
    );

    expect(Object.keys(answer).sort()).toEqual(['checks', 'drive', 'engineVersion', 'mechanism', 'name']);
    expect(answer.drive).toEqual(overJson(evaluateValidDesign(design).drive));
  });

  it('when the engine rejects a design in the worker, then the main thread gets the AppError with its field paths', async () => {
    // A sweep over a path that is not an input is refused by the service inside the worker.
    const design = demo();

    const failure = await calcJson({ kind: 'sweep', body: bytes({ design, path: 'frame.nothingHere', values: [1] }) }).catch(
      (err: unknown) => err,
    );

    expect(failure).toBeInstanceOf(AppError);
    expect((failure as AppError).status).toBe(400);
    expect((failure as AppError).details).toEqual([{ path: 'path', message: '"frame.nothingHere" is not an input of the design' }]);
  });

  it.each([
    ['not JSON', Buffer.from('{"design": '), 'invalid_json', undefined],
    ['a JSON string', Buffer.from('"design"'), 'invalid_json', undefined],
    ['no body', null, 'validation_failed', [{ path: 'body', message: 'must be a JSON object' }]],
  ])('when the body is %s, then the worker answers 400 %s like the API parser would', async (_what, body, code, details) => {
    const failure = (await calcJson({ kind: 'result', body: body && new Uint8Array(body) }).catch((err: unknown) => err)) as AppError;

    expect(failure).toBeInstanceOf(AppError);
    expect(failure.code).toBe(code);
    if (details) expect(failure.details).toEqual(details);
  });

  it('when a revision is frozen in the pool, then it equals freezing on the main thread', async () => {
    const inputs = { ...defaultDesign('hbot'), name: 'Frozen in a thread' };

    const frozen = await freezeInPool(inputs);

    expect(frozen).toEqual(freezeDesign(inputs));
  });

  it('when a sheet is rendered in the PDF pool, then both paper sizes are PDFs whose hashes match their bytes', async () => {
    const frozen = freezeDesign({ ...defaultDesign('corexy'), name: 'Sheet in a thread' });

    const sheet = await renderSheetsInPool({
      designName: 'Sheet in a thread',
      revisionNumber: 1,
      mechanism: 'corexy',
      designer: { name: 'Dana Designer', email: 'designer@example.test' },
      approval: { reviewerName: 'Riley Reviewer', approvedAt: new Date('2026-12-01T10:00:00Z'), comment: 'ok' },
      inputs: frozen.inputs,
      result: frozen.result,
      fingerprint: frozen.fingerprint,
      appUrl: 'http://127.0.0.1:5180',
    });

    expect(sheet.a4.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(sheet.letter.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const { createHash } = await import('node:crypto');
    expect(sheet.a4Sha256).toBe(createHash('sha256').update(sheet.a4).digest('hex'));
    expect(sheet.letterSha256).not.toBe(sheet.a4Sha256);
  }, 60_000); // a cold thread loads pdfmake and the fonts first; the machine may be busy

  it.runIf(process.platform === 'linux' && niceOf('self') === 0)(
    'when the pool threads run (Linux), then each runs at the configured niceness and the calling thread keeps its own',
    async () => {
      // Arrange: enough concurrent work to start every engine thread.
      const design = demo();

      // Act
      await Promise.all(Array.from({ length: 4 }, () => calcJson({ kind: 'result', body: bytes({ design }) })));

      // Assert: each pool thread lowered its own priority (entry.mjs); this thread, the event loop's stand-in, did not.
      const niced = fs.readdirSync('/proc/self/task').filter((tid) => niceOf(`self/task/${tid}`) === getConfig().workers.nice);
      expect(getConfig().workers.nice).toBe(10);
      expect(niced.length).toBeGreaterThanOrEqual(getEnginePool().threads.length);
      expect(niceOf('thread-self')).toBe(0);
    },
  );
});

describe('pickSections', () => {
  it('when no sections are asked, then the whole result is answered', () => {
    const result = evaluateValidDesign(demo());

    expect(pickSections(result)).toBe(result);
  });

  it('when every section is named, then the answer has every field of the result (none left unnamed)', () => {
    // Arrange
    const result = evaluateValidDesign(demo());

    // Act
    const picked = pickSections(result, RESULT_SECTIONS);

    // Assert
    expect(Object.keys(picked).sort()).toEqual(Object.keys(result).sort());
  });

  it('when the second layer sections are asked, then only they come back (with the identification)', () => {
    const result = evaluateValidDesign(demo());

    const picked = pickSections(result, ['errorBudget', 'job']);

    expect(Object.keys(picked).sort()).toEqual(['engineVersion', 'errorBudget', 'job', 'mechanism', 'name']);
    expect(picked.errorBudget).toBe(result.errorBudget);
  });
});
