import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tensionFromFrequencyN, type DesignResult } from '@/engine';
import { createApp } from '../../server/app';
import { resetConfigCache } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { AuditLog, Measurement, type Role } from '../../server/models';
import { createApprovedSheet, createUser, signIn, signedInAs, type Agent } from '../helpers/factories';
import { synthWav, typicalPluck } from '../unit/server/uploads/synthRecording';

// Each test file stores uploads in its own folder, so counting files there is not disturbed by other files.
const UPLOAD_DIR = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-measurements-'));
process.env.UPLOAD_DIR = UPLOAD_DIR;
resetConfigCache();
const app = createApp();

type Who = 'admin' | 'designer' | 'reviewer' | 'maker' | 'anonymous';
const agents = {} as Record<Who, Agent>;
let corexy: Awaited<ReturnType<typeof createApprovedSheet>>;

beforeAll(async () => {
  for (const who of ['admin', 'designer', 'reviewer', 'maker'] as const) agents[who] = (await signedInAs(app, [who as Role])).agent;
  agents.anonymous = request.agent(app);
  const owner = await createUser({ roles: ['designer'] });
  const approver = await createUser({ roles: ['reviewer'] });
  corexy = await createApprovedSheet({ owner: owner.user, approver: approver.user, mechanism: 'corexy' });
});

afterAll(async () => {
  await closeSequelize();
  delete process.env.UPLOAD_DIR;
  resetConfigCache();
  fs.rmSync(UPLOAD_DIR, { recursive: true, force: true });
});

/** Every file under the upload folder (the content store). */
function storedFiles(): string[] {
  if (!fs.existsSync(UPLOAD_DIR)) return [];
  return (fs.readdirSync(UPLOAD_DIR, { recursive: true }) as string[])
    .map((p) => path.join(UPLOAD_DIR, p))
    .filter((p) => fs.statSync(p).isFile());
}

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
const spanOf = (result: DesignResult, id: string) => result.belts.flatMap((b) => b.spans).find((s) => s.id === id)!;

/**
 * Published case STR-T-FROM-F (reference/halliday-resnick-walker/span-tension.json; Halliday, Resnick & Walker,
 * Fundamentals of Physics, ch. 16): a 350 mm span of 0.0075 kg/m sounding at 95 Hz carries 33.1669 N.
 */
const PUBLISHED = { spanMm: 350, frequencyHz: 95, linearMassKgPerM: 0.0075, tensionN: 33.1669 };

async function rowsOf(sheetId: number): Promise<number> {
  return Measurement.count({ where: { sheetId } });
}

describe('POST /api/sheets/:id/measurements (typed)', () => {
  it('when a maker types a frequency for the reference span, then 201 with the published string-law tension, target and deviation, and GET lists it as the latest', async () => {
    // Arrange: the belt is the published case's (0.0075 kg/m); the same tension sounds at 95 Hz × 350 mm / L on a
    // span of length L (T = 4·μ·L²·f² depends on L·f only), so the API must report the published 33.1669 N.
    const span = spanOf(corexy.result, corexy.result.belts[0].referenceSpanId!);
    expect(corexy.inputs.belt.linearMassKgPerM).toBe(PUBLISHED.linearMassKgPerM);
    const frequencyHz = (PUBLISHED.frequencyHz * PUBLISHED.spanMm) / span.lengthMm;
    // Act
    const res = await agents.maker.post(`/api/sheets/${corexy.sheetId}/measurements`).send({ spanId: span.id, frequencyHz });
    const list = await agents.designer.get(`/api/sheets/${corexy.sheetId}/measurements`);
    // Assert
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      sheetId: corexy.sheetId,
      spanId: span.id,
      beltId: 'A',
      source: 'typed',
      confidence: null,
      spectrum: null,
      recording: null,
      frequencyHz,
    });
    expect(res.body.spanLengthMm).toBeCloseTo(span.lengthMm, 9);
    expect(res.body.tensionN).toBeCloseTo(PUBLISHED.tensionN, 3);
    expect(res.body.targetFrequencyHz).toBeCloseTo(span.targetFrequencyHz, 9);
    // The target frequency was computed from the design pretension, so the target tension is that pretension.
    expect(res.body.targetTensionN).toBeCloseTo(corexy.inputs.pretensionN, 6);
    expect(res.body.deviationPct).toBeCloseTo(((PUBLISHED.tensionN - corexy.inputs.pretensionN) / corexy.inputs.pretensionN) * 100, 2);
    expect(list.status).toBe(200);
    const summary = list.body.spans.find((s: { spanId: string }) => s.spanId === span.id);
    expect(summary).toMatchObject({ beltId: 'A', isReference: true, latest: { id: res.body.id, tensionN: res.body.tensionN }, count: 1 });
    expect(list.body.items.map((m: { id: number }) => m.id)).toContain(res.body.id);
  });

  it('when a frequency arrives as multipart text with a decimal comma, then it is read as a number', async () => {
    const span = spanOf(corexy.result, corexy.result.belts[1].referenceSpanId!);
    const res = await agents.maker.post(`/api/sheets/${corexy.sheetId}/measurements`).field('spanId', span.id).field('frequencyHz', '88,5');
    expect(res.status).toBe(201);
    expect(res.body.frequencyHz).toBe(88.5);
  });
});

describe('POST /api/sheets/:id/measurements (recording)', () => {
  it('when a maker uploads a synthetic pluck WAV (harmonics, noise, mains hum), then the fundamental is found within 0.5 Hz, the tension follows from it, and the recording and spectrum are stored', async () => {
    // Arrange
    const span = spanOf(corexy.result, corexy.result.belts[0].spans.find((s) => !s.fixedLength)!.id);
    const f0 = Number((span.targetFrequencyHz * 1.03).toFixed(2));
    const wav = synthWav({
      sampleRateHz: 16000,
      durationS: 2,
      pluck: typicalPluck(f0),
      hum: [
        [50, 0.02],
        [100, 0.01],
      ],
      noiseRms: 0.005,
      seed: 11,
    });
    const before = storedFiles().length;
    // Act
    const res = await agents.maker
      .post(`/api/sheets/${corexy.sheetId}/measurements`)
      .field('spanId', span.id)
      .attach('file', wav, { filename: 'pluck.wav', contentType: 'audio/wav' });
    // Assert
    expect(res.status).toBe(201);
    expect(res.body.source).toBe('recording');
    expect(Math.abs(res.body.frequencyHz - f0)).toBeLessThan(0.5);
    // The engine's string law, itself checked against the published case in tests/unit/engine/tension.test.ts
    const engineTensionN = tensionFromFrequencyN({
      frequencyHz: res.body.frequencyHz,
      linearMassKgPerM: corexy.inputs.belt.linearMassKgPerM,
      spanMm: span.lengthMm,
    });
    expect(res.body.tensionN).toBeCloseTo(engineTensionN, 9);
    expect(res.body.confidence).toBeGreaterThan(0.5);
    expect(res.body.confidence).toBeLessThanOrEqual(1);
    expect(res.body.spectrum.frequencyHz.length).toBe(res.body.spectrum.magnitudeDb.length);
    expect(res.body.spectrum.frequencyHz.length).toBeGreaterThan(10);
    expect(res.body.spectrum.frequencyHz.length).toBeLessThanOrEqual(512);
    expect(res.body.recording).toMatchObject({ sha256: sha256(wav), size: wav.length, fileName: 'pluck.wav' });
    const files = storedFiles();
    expect(files.length).toBe(before + 1);
    expect(files.some((f) => path.basename(f) === sha256(wav))).toBe(true);

    const one = await agents.reviewer.get(`/api/sheets/${corexy.sheetId}/measurements/${res.body.id}`);
    expect(one.status).toBe(200);
    expect(one.body.spectrum).toEqual(res.body.spectrum);
    const audio = await agents.maker
      .get(`/api/sheets/${corexy.sheetId}/measurements/${res.body.id}/recording`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(audio.status).toBe(200);
    expect(audio.headers['content-type']).toBe('audio/wav');
    expect(sha256(audio.body as Buffer)).toBe(sha256(wav));
  });

  it('when the second harmonic is louder than the fundamental, then the fundamental is still reported', async () => {
    const span = spanOf(corexy.result, corexy.result.belts[1].spans.find((s) => !s.fixedLength)!.id);
    const f0 = Number(span.targetFrequencyHz.toFixed(1));
    const wav = synthWav({
      sampleRateHz: 22050,
      durationS: 1.5,
      pluck: typicalPluck(f0, { harmonicAmplitudes: [0.2, 0.6, 0.15, 0.05] }),
      noiseRms: 0.003,
      seed: 5,
    });
    const res = await agents.admin
      .post(`/api/sheets/${corexy.sheetId}/measurements`)
      .field('spanId', span.id)
      .attach('file', wav, 'pluck-b.wav');
    expect(res.status).toBe(201);
    expect(Math.abs(res.body.frequencyHz - f0)).toBeLessThan(0.5);
  });
});

describe('POST /api/sheets/:id/measurements — bad input saves nothing', () => {
  const spanId = () => corexy.result.belts[0].referenceSpanId!;

  async function expectNothingSaved(
    send: () => Promise<request.Response>,
    status: number,
    code?: string | RegExp,
    message?: RegExp,
  ): Promise<request.Response> {
    const rowsBefore = await rowsOf(corexy.sheetId);
    const filesBefore = storedFiles().length;
    const auditBefore = await AuditLog.count({ where: { action: 'measurement.create', entityId: corexy.sheetId } });
    const res = await send();
    expect(res.status).toBe(status);
    if (code) expect(res.body.error.code).toMatch(code);
    if (message) expect(res.body.error.message).toMatch(message);
    expect(await rowsOf(corexy.sheetId)).toBe(rowsBefore);
    expect(storedFiles().length).toBe(filesBefore);
    expect(await AuditLog.count({ where: { action: 'measurement.create', entityId: corexy.sheetId } })).toBe(auditBefore);
    return res;
  }

  it("when the span is not one of the sheet revision's spans, then 400 naming spanId", async () => {
    const res = await expectNothingSaved(
      () => agents.maker.post(`/api/sheets/${corexy.sheetId}/measurements`).send({ spanId: 'Z:nowhere->else', frequencyHz: 90 }),
      400,
      'validation_failed',
    );
    expect(res.body.error.details[0].path).toBe('spanId');
    expect(res.body.error.details[0].message).toContain(corexy.result.belts[0].referenceSpanId);
  });

  it.each([
    [{ frequencyHz: 90 }, 'spanId'],
    [{ spanId: 'A:motor->backLeft' }, 'frequencyHz'],
    [{ spanId: 'A:motor->backLeft', frequencyHz: -3 }, 'frequencyHz'],
    [{ spanId: 'A:motor->backLeft', frequencyHz: 'ninety' }, 'frequencyHz'],
    [{ spanId: 'A:motor->backLeft', frequencyHz: 90, colour: 'red' }, 'colour'],
  ])('when the body is %j, then 400 naming %s', async (body, field) => {
    const res = await expectNothingSaved(
      () => agents.maker.post(`/api/sheets/${corexy.sheetId}/measurements`).send(body),
      400,
      'validation_failed',
    );
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(field);
  });

  it('when both a frequency and a recording are sent, then 400 and nothing is stored', async () => {
    const wav = synthWav({ sampleRateHz: 8000, durationS: 1, pluck: typicalPluck(120) });
    await expectNothingSaved(
      () =>
        agents.maker
          .post(`/api/sheets/${corexy.sheetId}/measurements`)
          .field('spanId', spanId())
          .field('frequencyHz', '120')
          .attach('file', wav, 'p.wav'),
      400,
      'validation_failed',
    );
  });

  it('when the recording is larger than 2 MB, then 413', async () => {
    const wav = synthWav({ sampleRateHz: 96000, durationS: 8, bitDepth: '24', pluck: typicalPluck(120) });
    expect(wav.length).toBeGreaterThan(2 * 1024 * 1024);
    const res = await expectNothingSaved(
      () => agents.maker.post(`/api/sheets/${corexy.sheetId}/measurements`).field('spanId', spanId()).attach('file', wav, 'long.wav'),
      413,
      'payload_too_large',
    );
    expect(res.body.error.message).toContain('2 MB');
  });

  it.each([
    [
      'a PNG named .wav',
      Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(64, 1)]),
      'photo.wav',
      'audio/wav',
    ],
    ['a text file', Buffer.from('speed_rpm,torque_Ncm\n0,40\n'), 'notes.txt', 'text/plain'],
    ['a real WAV named .png', synthWav({ sampleRateHz: 8000, durationS: 1, pluck: typicalPluck(100) }), 'pluck.png', 'image/png'],
    [
      'a real WAV declared as image/png',
      synthWav({ sampleRateHz: 8000, durationS: 1, pluck: typicalPluck(100) }),
      'pluck.wav',
      'image/png',
    ],
  ])('when the "recording" is %s, then 415', async (_what, bytes, filename, contentType) => {
    await expectNothingSaved(
      () =>
        agents.maker
          .post(`/api/sheets/${corexy.sheetId}/measurements`)
          .field('spanId', spanId())
          .attach('file', bytes, { filename, contentType }),
      415,
      /unsupported_media_type|empty_file/,
    );
  });

  it.each([
    ['silent', synthWav({ sampleRateHz: 16000, durationS: 1.5 }), /silent/i],
    ['only noise', synthWav({ sampleRateHz: 16000, durationS: 1.5, noiseRms: 0.05, seed: 3 }), /no clear tone|pluck closer/i],
    [
      'truncated (header says more data than there is)',
      synthWav({ sampleRateHz: 16000, durationS: 1.5, pluck: typicalPluck(110) }).subarray(0, 3001),
      /damaged|incomplete|again/i,
    ],
  ])('when the WAV is %s, then 422 with a message the maker understands', async (_what, wav, message) => {
    await expectNothingSaved(
      () => agents.maker.post(`/api/sheets/${corexy.sheetId}/measurements`).field('spanId', spanId()).attach('file', wav, 'pluck.wav'),
      422,
      /^recording_/,
      message,
    );
  });
});

describe('roles and unknown sheets', () => {
  it.each([
    ['designer', 403],
    ['reviewer', 403],
    ['anonymous', 401],
  ] as const)('when a %s records a measurement, then %i and nothing is saved', async (who, status) => {
    const before = await rowsOf(corexy.sheetId);
    const res = await agents[who]
      .post(`/api/sheets/${corexy.sheetId}/measurements`)
      .send({ spanId: corexy.result.belts[0].referenceSpanId, frequencyHz: 90 });
    expect(res.status).toBe(status);
    expect(await rowsOf(corexy.sheetId)).toBe(before);
  });

  it('when a designer uploads a recording, then 403 before the file is read and nothing is stored', async () => {
    const files = storedFiles().length;
    const wav = synthWav({ sampleRateHz: 8000, durationS: 1, pluck: typicalPluck(100) });
    const res = await agents.designer
      .post(`/api/sheets/${corexy.sheetId}/measurements`)
      .field('spanId', 'A:motor->backLeft')
      .attach('file', wav, 'p.wav');
    expect(res.status).toBe(403);
    expect(storedFiles().length).toBe(files);
  });

  it.each(['maker', 'designer', 'reviewer', 'admin'] as const)('when a %s reads the measurements, then 200', async (who) => {
    const res = await agents[who].get(`/api/sheets/${corexy.sheetId}/measurements`);
    expect(res.status).toBe(200);
    expect(res.body.canRecord).toBe(who === 'maker' || who === 'admin');
  });

  it('when the sheet does not exist, then 404 for POST and GET', async () => {
    const post = await agents.maker.post('/api/sheets/987654321/measurements').send({ spanId: 'A:motor->backLeft', frequencyHz: 90 });
    const get = await agents.maker.get('/api/sheets/987654321/measurements');
    expect(post.status).toBe(404);
    expect(get.status).toBe(404);
  });
});

describe('GET /api/sheets/:id/measurements — crossed belts', () => {
  it('when the corresponding spans of belts A and B differ by more than 5 % in tension, then the pair is flagged; when within, it is not', async () => {
    // Arrange: a fresh CoreXY sheet; belt A on target, belt B 8 % slack in tension (frequency × √0.92).
    const owner = await createUser({ roles: ['designer'] });
    const approver = await createUser({ roles: ['reviewer'] });
    const sheet = await createApprovedSheet({ owner: owner.user, approver: approver.user, mechanism: 'corexy' });
    const [a, b] = sheet.result.belts;
    const refA = spanOf(sheet.result, a.referenceSpanId!);
    const refB = spanOf(sheet.result, b.referenceSpanId!);
    const url = `/api/sheets/${sheet.sheetId}/measurements`;
    await agents.maker.post(url).send({ spanId: refA.id, frequencyHz: refA.targetFrequencyHz });
    await agents.maker.post(url).send({ spanId: refB.id, frequencyHz: refB.targetFrequencyHz * Math.sqrt(0.92) });
    // Act
    const flagged = await agents.maker.get(url);
    await agents.maker.post(url).send({ spanId: refB.id, frequencyHz: refB.targetFrequencyHz * Math.sqrt(0.98) });
    const settled = await agents.maker.get(url);
    // Assert
    type Pair = { spanIds: string[]; differencePct: number | null; isMismatch: boolean };
    const pairOf = (body: { pairs: Pair[] }) => body.pairs.find((p) => p.spanIds.includes(refA.id))!;
    expect(flagged.body.mechanism).toBe('corexy');
    expect(flagged.body.tolerances).toMatchObject({
      crossedBeltPct: 5,
      source: expect.stringContaining('typical values: belt makers’ installation guides'),
    });
    expect(pairOf(flagged.body)).toMatchObject({ spanIds: [refA.id, refB.id], isMismatch: true });
    expect(pairOf(flagged.body).differencePct).toBeCloseTo((0.08 / 0.96) * 100, 6);
    expect(pairOf(settled.body)).toMatchObject({ isMismatch: false });
    expect(pairOf(settled.body).differencePct).toBeCloseTo((0.02 / 0.99) * 100, 6);
    expect(settled.body.spans.find((s: { spanId: string }) => s.spanId === refB.id).count).toBe(2);
    // Unmeasured pairs are never flagged.
    expect(
      settled.body.pairs
        .filter((p: { differencePct: number | null }) => p.differencePct === null)
        .every((p: { isMismatch: boolean }) => !p.isMismatch),
    ).toBe(true);
  });

  it('when the stage is cartesian (no crossed belts), then there are no pairs', async () => {
    const owner = await createUser({ roles: ['designer'] });
    const approver = await createUser({ roles: ['reviewer'] });
    const sheet = await createApprovedSheet({ owner: owner.user, approver: approver.user, mechanism: 'cartesian' });
    const res = await agents.maker.get(`/api/sheets/${sheet.sheetId}/measurements`);
    expect(res.status).toBe(200);
    expect(res.body.pairs).toEqual([]);
    expect(res.body.spans.length).toBe(sheet.result.belts.flatMap((b) => b.spans).length);
    expect(res.body.spans.every((s: { status: string }) => s.status === 'unmeasured')).toBe(true);
  });

  it('when another maker records a pluck, then the list shows who recorded it', async () => {
    const maker = await createUser({ roles: ['maker'], name: 'Pat Plucker' });
    const agent = await signIn(app, maker.email, maker.password);
    const res = await agent
      .post(`/api/sheets/${corexy.sheetId}/measurements`)
      .send({ spanId: corexy.result.belts[0].referenceSpanId, frequencyHz: 91 });
    const list = await agents.reviewer.get(`/api/sheets/${corexy.sheetId}/measurements`);
    expect(list.body.items.find((m: { id: number }) => m.id === res.body.id).measuredBy).toEqual({
      id: maker.user.id,
      name: 'Pat Plucker',
    });
  });
});
