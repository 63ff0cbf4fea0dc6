import { deflateSync } from 'node:zlib';
import * as wavefile from 'wavefile';
import { Op } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { DesignInput, DesignResult } from '@/engine';
import type { SeedContext } from '../migrator';
import { Attachment, AuditLog, Design, Measurement, Part, Revision, Sheet, User } from '../models';
import { tensionFigures } from '../services/measurements.service';
import { getContentStore, markUnreferenced, referenceContent, removeUnreferencedContent } from '../storage';
import { analysePluck, parseTorqueCsv, sha256Of } from '../uploads';

// Uploads of the demo workshop, so a fresh start shows every part of issue 6 populated:
//   - belt tension measurements on both approved sheets of the "Bench dispensing stage" (CoreXY): the first batch
//     (superseded sheet) typed, with belt B set a little slack, so the crossed-belt mismatch flag shows; the current
//     sheet with typed plucks near target and one analysed from a synthetic recording;
//   - a torque–speed table (illustrative values, from memory) on the "42 mm 1.8° long stack" shelf motor;
//   - a small PNG sketch and a CSV cut list attached to the "Bench dispensing stage".
// Rows are written with the models on the seeder's connection; bytes go to the content store (UPLOAD_DIR, or the S3
// bucket with STORAGE=s3), registered in use in the same transaction.

const DAY = 24 * 3_600_000;
const BENCH = 'Bench dispensing stage';
export const TORQUE_MOTOR = '42 mm 1.8° long stack (48 mm body)';

/** Illustrative pull-out curve of a generic 42 mm long-stack motor at 24 V: a typical shape from memory, not a datasheet. */
export const DEMO_TORQUE_CSV = [
  '# Illustrative pull-out torque, generic 42 mm long-stack stepper at 24 V and 1.7 A',
  '# (typical shape, not a datasheet; replace with your motor’s datasheet)',
  'speed_rpm,torque_Ncm',
  '0,50',
  '60,50',
  '300,48',
  '450,44',
  '600,37',
  '750,30',
  '900,23',
  '1050,16',
  '1200,10',
  '',
].join('\n');

/** A cut list as a designer might keep it beside the design: the belts of the current sheet and the frame. */
function demoCutListCsv(result: DesignResult | undefined, inputs: DesignInput | undefined): string {
  const belts = (result?.belts ?? []).map((b) => `${b.label},1,${Math.round(b.cutLengthMm)},${b.loopTeeth} teeth plus clamp allowance`);
  const frame = inputs
    ? [
        `frame profile ${inputs.frame.extrusionMm} mm (X),2,${inputs.frame.outerXMm},outer frame`,
        `frame profile ${inputs.frame.extrusionMm} mm (Y),2,${inputs.frame.outerYMm},outer frame`,
      ]
    : [];
  return ['item,quantity,length_mm,note', ...belts, ...frame, ''].join('\n');
}

const WaveFileClass: typeof wavefile.WaveFile =
  (wavefile as unknown as { WaveFile?: typeof wavefile.WaveFile }).WaveFile ??
  (wavefile as unknown as { default: { WaveFile: typeof wavefile.WaveFile } }).default.WaveFile;

/**
 * A synthetic pluck: a decaying harmonic series at `f0Hz` with a little seeded noise, 16-bit mono at 8 kHz, 1.5 s
 * (about 24 kB) — what a phone records when a span is plucked close to it.
 */
export function syntheticPluckWav(f0Hz: number, seed = 7): Buffer {
  const rate = 8000;
  const n = Math.round(1.5 * rate);
  let state = seed >>> 0;
  const noise = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32 - 0.5;
  };
  const samples: number[] = new Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / rate;
    const tau = t - 0.2;
    let v = 0;
    if (tau >= 0) {
      [0.5, 0.25, 0.12, 0.06].forEach((a, k) => {
        const h = k + 1;
        v += a * Math.sin(2 * Math.PI * h * f0Hz * tau) * Math.exp((-tau * Math.sqrt(h)) / 0.35);
      });
    }
    v += 0.004 * noise();
    samples[i] = Math.max(-32767, Math.min(32767, Math.round(v * 32767)));
  }
  const wav = new WaveFileClass();
  wav.fromScratch(1, rate, '16', samples);
  return Buffer.from(wav.toBuffer());
}

const CRC_TABLE = (() => {
  const table = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    table[n] = c >>> 0;
  }
  return table;
})();

function crc32(bytes: Buffer): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/**
 * A small greyscale PNG sketch of a crossed-belt stage seen from above: the frame, the gantry, the carriage and the
 * two belts crossing (160 × 120 px, under 2 kB).
 */
export function demoSketchPng(): Buffer {
  const w = 160;
  const h = 120;
  const px = new Uint8Array(w * h).fill(250);
  const dot = (x: number, y: number, v = 40) => {
    const xi = Math.round(x);
    const yi = Math.round(y);
    if (xi >= 0 && xi < w && yi >= 0 && yi < h) px[yi * w + xi] = v;
  };
  const line = (x0: number, y0: number, x1: number, y1: number, v = 40) => {
    const steps = Math.max(Math.abs(x1 - x0), Math.abs(y1 - y0));
    for (let i = 0; i <= steps; i++) dot(x0 + ((x1 - x0) * i) / steps, y0 + ((y1 - y0) * i) / steps, v);
  };
  const rect = (x0: number, y0: number, x1: number, y1: number, v = 40) => {
    line(x0, y0, x1, y0, v);
    line(x1, y0, x1, y1, v);
    line(x1, y1, x0, y1, v);
    line(x0, y1, x0, y0, v);
  };
  rect(8, 8, 151, 111);
  rect(10, 52, 149, 62, 90); // gantry
  rect(72, 48, 88, 66, 20); // carriage
  line(14, 12, 80, 57, 120); // belt A
  line(146, 12, 80, 57, 160); // belt B
  const raw = Buffer.alloc((w + 1) * h);
  for (let y = 0; y < h; y++) {
    raw[y * (w + 1)] = 0; // filter: none
    Buffer.from(px.subarray(y * w, (y + 1) * w)).copy(raw, y * (w + 1) + 1);
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0);
  ihdr.writeUInt32BE(h, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 0; // greyscale
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', deflateSync(raw)),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

type Frozen = { sheet: Sheet; inputs: DesignInput; result: DesignResult };

async function benchSheets(): Promise<Frozen[]> {
  const design = await Design.findOne({ where: { name: BENCH }, attributes: ['id'] });
  if (!design) return [];
  const sheets = (await Sheet.findAll({
    where: { designId: design.id },
    attributes: ['id', 'approvedAt'],
    include: [{ model: Revision, as: 'revision', attributes: ['number', 'inputs', 'result'] }],
    order: [['approvedAt', 'ASC']],
  })) as (Sheet & { revision: Revision })[];
  const json = <T>(v: unknown): T => (typeof v === 'string' ? JSON.parse(v) : v) as T;
  return sheets.map((sheet) => ({
    sheet,
    inputs: json<DesignInput>(sheet.revision.inputs),
    result: json<DesignResult>(sheet.revision.result),
  }));
}

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const store = getContentStore();
  const byEmail = async (email: string) => User.findOne({ where: { email } });
  const maker = await byEmail('maker@example.test');
  const admin = await byEmail('admin@example.test');
  const designer = await byEmail('designer@example.test');
  if (!maker || !admin || !designer) throw new Error('the uploads demo needs the demo users (seeder 202612020001-demo-users)');
  const now = Date.now();
  const at = (daysAgo: number, minutes = 0) => new Date(now - daysAgo * DAY + minutes * 60_000);

  // Prepared outside the transaction: pure work (the analysis takes a fraction of a second).
  const sheets = await benchSheets();
  const png = demoSketchPng();
  const current = sheets[sheets.length - 1];
  const cutList = Buffer.from(demoCutListCsv(current?.result, current?.inputs), 'utf8');
  const torqueCsv = Buffer.from(DEMO_TORQUE_CSV, 'utf8');
  const torqueTable = parseTorqueCsv(DEMO_TORQUE_CSV);
  const stored: string[] = [];

  try {
    await context.sequelize.transaction(async (transaction) => {
      if ((await Measurement.count({ transaction })) > 0 || (await Attachment.count({ transaction })) > 0) return; // already populated by hand

      for (const [index, frozen] of sheets.entries()) {
        const isCurrent = index === sheets.length - 1;
        const mu = frozen.inputs.belt.linearMassKgPerM;
        const spanById = new Map(frozen.result.belts.flatMap((b) => b.spans.map((s) => [s.id, { span: s, beltId: b.id }] as const)));
        const references = frozen.result.belts.map((b) => b.referenceSpanId).filter((id): id is string => id !== null);
        // First batch: belt B left ~9 % slack in tension (frequency × 0.955) → the crossed-belt flag shows.
        // Current batch: both within a percent or two of the target.
        const factors = isCurrent ? [1.008, 0.995] : [1.01, 0.955];
        const base = isCurrent ? 2 : 17;
        const rows: Array<{ spanId: string; frequencyHz: number; minutes: number; recording?: Buffer }> = references.map((id, i) => ({
          spanId: id,
          frequencyHz: Number((spanById.get(id)!.span.targetFrequencyHz * (factors[i] ?? 1)).toFixed(1)),
          minutes: 10 * i,
        }));
        if (isCurrent) {
          // One recorded pluck on the first belt's longest moving span, analysed like an upload.
          const moving = frozen.result.belts[0]?.spans.filter((s) => !s.fixedLength).sort((a, b) => b.lengthMm - a.lengthMm)[0];
          if (moving)
            rows.push({ spanId: moving.id, frequencyHz: 0, minutes: 30, recording: syntheticPluckWav(moving.targetFrequencyHz * 1.02) });
        }
        for (const row of rows) {
          const found = spanById.get(row.spanId);
          if (!found) continue;
          let frequencyHz = row.frequencyHz;
          let confidence: number | null = null;
          let spectrum: { frequencyHz: number[]; magnitudeDb: number[] } | null = null;
          let sha256: string | null = null;
          if (row.recording) {
            const analysis = analysePluck(row.recording);
            frequencyHz = analysis.frequencyHz;
            confidence = analysis.confidence;
            spectrum = {
              frequencyHz: analysis.spectrum.frequencyHz.map((f) => Number(f.toFixed(2))),
              magnitudeDb: analysis.spectrum.magnitudeDb.map((m) => Number(m.toFixed(2))),
            };
            sha256 = sha256Of(row.recording);
            await referenceContent(sha256, row.recording.length, transaction);
            await store.put(row.recording);
            stored.push(sha256);
          }
          const figures = tensionFigures({ span: found.span, linearMassKgPerM: mu, frequencyHz });
          const measuredAt = at(base, row.minutes);
          await Measurement.create(
            {
              sheetId: frozen.sheet.id,
              spanId: found.span.id,
              beltId: found.beltId,
              spanLengthMm: found.span.lengthMm,
              linearMassKgPerM: mu,
              frequencyHz,
              ...figures,
              targetFrequencyHz: found.span.targetFrequencyHz,
              source: row.recording ? 'recording' : 'typed',
              confidence,
              spectrum,
              recordingSha256: sha256,
              recordingSize: row.recording ? row.recording.length : null,
              recordingName: row.recording ? 'pluck-belt-a.wav' : null,
              measuredById: maker.id,
              measuredAt,
            },
            { transaction },
          );
          await AuditLog.create(
            {
              actorId: maker.id,
              action: 'measurement.create',
              entity: 'sheet',
              entityId: frozen.sheet.id,
              fromState: null,
              toState: row.recording ? 'recording' : 'typed',
              reason: `${found.span.id}: ${frequencyHz.toFixed(2)} Hz → ${figures.tensionN.toFixed(1)} N`,
              createdAt: measuredAt,
            },
            { transaction },
          );
        }
      }

      // The torque table of one shelf motor, with its source file.
      const motor = await Part.findOne({ where: { kind: 'motor', name: TORQUE_MOTOR }, transaction });
      if (motor) {
        const data = (typeof motor.data === 'string' ? JSON.parse(motor.data) : motor.data) as Record<string, unknown>;
        const points = torqueTable.points.map((p) => ({
          speedRevPerS: Number(p.speedRevPerS.toPrecision(6)),
          torqueNm: Number(p.torqueNm.toPrecision(6)),
        }));
        motor.data = { ...data, torqueCurve: points };
        motor.changed('data', true);
        motor.updatedById = admin.id;
        await motor.save({ transaction });
        const [sha256, size] = [sha256Of(torqueCsv), torqueCsv.length];
        await referenceContent(sha256, size, transaction);
        await store.put(torqueCsv);
        stored.push(sha256);
        await Attachment.create(
          {
            designId: null,
            partId: motor.id,
            uploadedById: admin.id,
            fileName: 'torque-42mm-long-stack.csv',
            mime: 'text/csv',
            size,
            sha256,
            createdAt: at(25),
          },
          { transaction },
        );
      }

      // Two files on the demo design.
      const bench = await Design.findOne({ where: { name: BENCH, ownerId: designer.id }, attributes: ['id'], transaction });
      if (bench) {
        const files: Array<[string, string, Buffer, number]> = [
          ['stage-sketch.png', 'image/png', png, 21],
          ['cut-list.csv', 'text/csv', cutList, 20],
        ];
        for (const [fileName, mime, bytes, daysAgo] of files) {
          const [sha256, size] = [sha256Of(bytes), bytes.length];
          await referenceContent(sha256, size, transaction);
          await store.put(bytes);
          stored.push(sha256);
          await Attachment.create(
            { designId: bench.id, partId: null, uploadedById: designer.id, fileName, mime, size, sha256, createdAt: at(daysAgo) },
            { transaction },
          );
        }
      }
    });
  } catch (err) {
    // Nothing half-seeded: bytes written for rows that were rolled back go again (unless other rows share them).
    await removeUnreferenced(context, stored);
    throw err;
  }
};

/** Removes the bytes of `hashes` that nothing refers to any more (through the content registry). */
async function removeUnreferenced(context: SeedContext, hashes: Iterable<string>): Promise<void> {
  const orphaned: string[] = [];
  for (const sha256 of new Set(hashes)) {
    if (await context.sequelize.transaction((transaction) => markUnreferenced(sha256, transaction))) orphaned.push(sha256);
  }
  await removeUnreferencedContent(orphaned, getContentStore(), context.sequelize);
}

export const down: MigrationFn<SeedContext> = async ({ context }) => {
  const sheets = await benchSheets();
  const sheetIds = sheets.map((s) => s.sheet.id);
  const motor = await Part.findOne({ where: { kind: 'motor', name: TORQUE_MOTOR } });
  const hashes = new Set<string>();
  await context.sequelize.transaction(async (transaction) => {
    if (sheetIds.length) {
      const rows = await Measurement.findAll({ where: { sheetId: { [Op.in]: sheetIds } }, attributes: ['recordingSha256'], transaction });
      rows.forEach((r) => r.recordingSha256 && hashes.add(r.recordingSha256));
      await Measurement.destroy({ where: { sheetId: { [Op.in]: sheetIds } }, transaction });
      await AuditLog.destroy({ where: { action: 'measurement.create', entity: 'sheet', entityId: { [Op.in]: sheetIds } }, transaction });
    }
    const names = ['stage-sketch.png', 'cut-list.csv', 'torque-42mm-long-stack.csv'];
    const attachments = await Attachment.findAll({ where: { fileName: { [Op.in]: names } }, transaction });
    attachments.forEach((a) => hashes.add(a.sha256));
    await Attachment.destroy({ where: { id: { [Op.in]: attachments.map((a) => a.id).concat(0) } }, transaction });
    if (motor) {
      const data = (typeof motor.data === 'string' ? JSON.parse(motor.data) : motor.data) as Record<string, unknown>;
      motor.data = { ...data, torqueCurve: null };
      motor.changed('data', true);
      await motor.save({ transaction });
    }
  });
  await removeUnreferenced(context, hashes);
};
