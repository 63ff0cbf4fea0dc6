import type { MeasurementDetail, PublicMeasurement, SheetMeasurements, SpanStatus, SpanSummary, CrossedPair } from '@/contracts';
import type { Transaction } from 'sequelize';
import { PLUCK_TENSION_TOLERANCE, pluckBandHz, tensionFromFrequencyN, type DesignInput, type DesignResult, type Mechanism } from '@/engine';
import { getSequelize } from '../db';
import { AppError, notFound } from '../errors';
import type { UploadedFile } from '../uploads/uploadedFile';
import { Measurement, Revision, Sheet, User, type MeasurementSource, type StoredSpectrum } from '../models';
import { getContentStore } from '../storage';
import { analysePluck, assertTypeMatches, PLUCK_DEFAULT_MAX_HZ } from '../uploads';
import { sanitiseFileName, storeWithRows, withUploadErrors } from './fileStore.service';
import { mayRecordMeasurement } from './access';
import { recordAudit } from './audit.service';
import { parseJson } from './storedJson';
import { latestSheets } from './sheets.service';
import type { PublicUser } from './users.service';

/** Largest pluck recording [bytes] (issue 6: 2 MB; 10 s of 16-bit mono at 96 kHz would not fit, at 48 kHz it does). */
export const RECORDING_MAX_BYTES = 2 * 1024 * 1024;

/**
 * Largest tension difference between the corresponding spans of the two crossed belts of a CoreXY stage before
 * they are flagged [%]. Common practice (from memory): builders aim to match the two belts within about 5 %,
 * because unequal belts skew the carriage's motion diagonally.
 */
export const CROSSED_BELT_TOLERANCE_PCT = 5;

/**
 * Tension within this share of the target counts as "on target" [%]: the engine's pluck tolerance, the same band the
 * design sheet prints beside each target (engine `PLUCK_TENSION_TOLERANCE`).
 */
export const TARGET_TOLERANCE_PCT = PLUCK_TENSION_TOLERANCE * 100;

/** Typed frequencies outside this range are refused [Hz]. */
export const TYPED_FREQUENCY_RANGE_HZ = { min: 1, max: 5000 } as const;

/** The body of POST /api/sheets/:id/measurements (JSON, or the text fields of the multipart form). */
export type RecordMeasurementInput = { spanId: string; frequencyHz?: number };

type MeasurementRow = Measurement & { measuredBy?: User | null };
type FrozenSheet = { sheet: Sheet; revision: Revision; inputs: DesignInput; result: DesignResult };
type SpanInfo = { span: DesignResult['belts'][number]['spans'][number]; belt: DesignResult['belts'][number] };

/** Where the two tolerances come from, in the words the maker reads beside them. */
const TOLERANCE_SOURCE =
  'typical values: belt makers’ installation guides allow about ±10 % on the set tension, and builders match crossed belts within about 5 %';

const round = (v: number, digits: number) => Number(v.toFixed(digits));

function toPublic(row: MeasurementRow): PublicMeasurement {
  return {
    id: row.id,
    sheetId: row.sheetId,
    spanId: row.spanId,
    beltId: row.beltId,
    spanLengthMm: row.spanLengthMm,
    linearMassKgPerM: row.linearMassKgPerM,
    frequencyHz: row.frequencyHz,
    tensionN: row.tensionN,
    targetFrequencyHz: row.targetFrequencyHz,
    targetTensionN: row.targetTensionN,
    deviationPct: row.deviationPct,
    source: row.source,
    confidence: row.confidence,
    hasSpectrum: row.spectrum !== null && row.spectrum !== undefined,
    recording: row.recordingSha256
      ? {
          sha256: row.recordingSha256,
          size: row.recordingSize ?? 0,
          fileName: row.recordingName ?? 'recording.wav',
          url: `/api/sheets/${row.sheetId}/measurements/${row.id}/recording`,
        }
      : null,
    measuredBy: { id: row.measuredById, name: row.measuredBy?.name ?? '' },
    measuredAt: new Date(row.measuredAt).toISOString(),
  };
}

/**
 * 404 unless the sheet exists; 409 `sheet_superseded` when a later revision of its design has been approved: a belt
 * is tensioned to the current sheet, and a measurement against an old one would be judged against the wrong targets
 * (issue 12, item 10). Checked before an upload is read, and again when the measurement is stored.
 */
export async function assertSheetTakesMeasurements(sheetId: number): Promise<void> {
  const sheet = (await Sheet.findByPk(sheetId, {
    attributes: ['id', 'designId'],
    include: [{ model: Revision, as: 'revision', attributes: ['number'] }],
  })) as (Sheet & { revision?: Revision }) | null;
  if (!sheet) throw notFound('Sheet');
  const newest = (await latestSheets([sheet.designId])).get(sheet.designId);
  if (newest && sheet.revision && newest.revisionNumber > sheet.revision.number) {
    throw new AppError(
      'sheet_superseded',
      `This sheet (revision ${sheet.revision.number}) was superseded by revision ${newest.revisionNumber}. Record measurements on the current sheet (sheet ${newest.sheetId}), whose targets the belts are set to.`,
      409,
      { details: { currentSheetId: newest.sheetId, currentRevisionNumber: newest.revisionNumber } },
    );
  }
}

async function loadFrozenSheet(sheetId: number): Promise<FrozenSheet> {
  const sheet = (await Sheet.findByPk(sheetId, {
    attributes: ['id', 'revisionId', 'designId'],
    include: [{ model: Revision, as: 'revision', attributes: ['id', 'number', 'inputs', 'result'] }],
  })) as (Sheet & { revision?: Revision }) | null;
  if (!sheet || !sheet.revision) throw notFound('Sheet');
  return {
    sheet,
    revision: sheet.revision,
    inputs: parseJson<DesignInput>(sheet.revision.inputs),
    result: parseJson<DesignResult>(sheet.revision.result),
  };
}

function findSpan(frozen: FrozenSheet, spanId: string): SpanInfo {
  for (const belt of frozen.result.belts) {
    const span = belt.spans.find((s) => s.id === spanId);
    if (span) return { span, belt };
  }
  const known = frozen.result.belts.flatMap((b) => b.spans.map((s) => s.id));
  throw new AppError('validation_failed', `"${spanId}" is not a belt span of this sheet.`, 400, {
    details: [{ path: 'spanId', message: `is not a span of revision ${frozen.revision.number}; one of: ${known.join(', ')}` }],
  });
}

function targetTensionN(span: Pick<SpanInfo['span'], 'targetFrequencyHz' | 'lengthMm'>, linearMassKgPerM: number): number {
  return tensionFromFrequencyN({ frequencyHz: span.targetFrequencyHz, linearMassKgPerM, spanMm: span.lengthMm });
}

/**
 * The tension a plucked span is under and how far it is from its target, by the string law T = 4·μ·L²·f²
 * (engine `tensionFromFrequencyN`; Halliday, Resnick & Walker, Fundamentals of Physics, ch. 16).
 * @param args.span - the span of the frozen revision (length [mm], target frequency [Hz])
 * @param args.linearMassKgPerM - the belt's mass per metre from the frozen revision [kg/m]
 * @param args.frequencyHz - measured fundamental [Hz]
 * @returns tension [N], target tension [N] and the deviation on tension [%]
 */
export function tensionFigures(args: {
  span: Pick<SpanInfo['span'], 'targetFrequencyHz' | 'lengthMm'>;
  linearMassKgPerM: number;
  frequencyHz: number;
}): { tensionN: number; targetTensionN: number; deviationPct: number } {
  const tensionN = tensionFromFrequencyN({
    frequencyHz: args.frequencyHz,
    linearMassKgPerM: args.linearMassKgPerM,
    spanMm: args.span.lengthMm,
  });
  const target = targetTensionN(args.span, args.linearMassKgPerM);
  return { tensionN, targetTensionN: target, deviationPct: ((tensionN - target) / target) * 100 };
}

/**
 * Records a belt-span pluck against an approved sheet (makers and admins). Either `frequencyHz` is typed, or a WAV
 * recording is uploaded and analysed (fundamental, confidence, spectrum). The tension follows from the string law
 * T = 4·μ·L²·f² with the span length and belt mass per metre of the sheet's FROZEN revision.
 *
 * Nothing is saved on failure: the recording is checked (415 when it is not a WAV by content or lies about its
 * type) and analysed (422 with a message for the maker) before anything is written; the row, its audit entry and
 * the recording's bytes are then written together in one transaction.
 * @throws 404 unknown sheet · 400 unknown span, both or neither of frequency and recording · 415 · 422
 */
export async function recordMeasurement(
  actor: PublicUser,
  sheetId: number,
  input: RecordMeasurementInput,
  file: UploadedFile | null,
): Promise<MeasurementDetail> {
  await assertSheetTakesMeasurements(sheetId);
  const frozen = await loadFrozenSheet(sheetId);
  const hasTyped = input.frequencyHz !== undefined;
  if (hasTyped && file) {
    throw new AppError('validation_failed', 'Give either a typed frequency or a recording, not both.', 400, {
      details: [{ path: 'frequencyHz', message: 'leave empty when uploading a recording' }],
    });
  }
  if (!hasTyped && !file) {
    throw new AppError('validation_failed', 'Type the measured frequency or upload a recording of the pluck.', 400, {
      details: [{ path: 'frequencyHz', message: 'is required unless a recording is uploaded in "file"' }],
    });
  }
  const { span, belt } = findSpan(frozen, input.spanId);
  const linearMassKgPerM = frozen.inputs.belt.linearMassKgPerM;

  let frequencyHz: number;
  let confidence: number | null = null;
  let spectrum: StoredSpectrum | null = null;
  if (file) {
    await withUploadErrors(() => assertTypeMatches(file.declaredMime, file.originalName, file.bytes, ['audio/wav']));
    // Look a little above the default band when the target itself is high (short, tight spans).
    const analysis = await withUploadErrors(() =>
      analysePluck(file.bytes, { maxHz: Math.max(PLUCK_DEFAULT_MAX_HZ, 2.5 * span.targetFrequencyHz) }),
    );
    frequencyHz = analysis.frequencyHz;
    confidence = analysis.confidence;
    spectrum = {
      frequencyHz: analysis.spectrum.frequencyHz.map((f) => round(f, 2)),
      magnitudeDb: analysis.spectrum.magnitudeDb.map((m) => round(m, 2)),
    };
  } else {
    frequencyHz = input.frequencyHz as number;
  }

  const { tensionN, targetTensionN: target, deviationPct } = tensionFigures({ span, linearMassKgPerM, frequencyHz });
  const values = {
    sheetId,
    spanId: span.id,
    beltId: belt.id,
    spanLengthMm: span.lengthMm,
    linearMassKgPerM,
    frequencyHz,
    tensionN,
    targetFrequencyHz: span.targetFrequencyHz,
    targetTensionN: target,
    deviationPct,
    source: (file ? 'recording' : 'typed') as MeasurementSource,
    confidence,
    spectrum,
    measuredById: actor.id,
    measuredAt: new Date(),
  };
  const insert = async (transaction: Transaction, sha256: string | null) => {
    const row = await Measurement.create(
      {
        ...values,
        recordingSha256: sha256,
        recordingSize: file ? file.bytes.length : null,
        recordingName: file ? sanitiseFileName(file.originalName, 'audio/wav') : null,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'measurement.create',
        entity: 'sheet',
        entityId: sheetId,
        toState: values.source,
        reason: `${span.id}: ${frequencyHz.toFixed(2)} Hz → ${tensionN.toFixed(1)} N (target ${target.toFixed(1)} N)${sha256 ? `, recording SHA-256 ${sha256}` : ''}`,
      },
      transaction,
    );
    return row;
  };
  const row = file
    ? await storeWithRows(file.bytes, (transaction, sha256) => insert(transaction, sha256))
    : await getSequelize().transaction((transaction) => insert(transaction, null));
  return getMeasurement(sheetId, row.id);
}

/** One measurement of a sheet, with its spectrum. */
export async function getMeasurement(sheetId: number, id: number): Promise<MeasurementDetail> {
  const row = (await Measurement.findOne({
    where: { id, sheetId },
    include: [{ model: User, as: 'measuredBy', attributes: ['id', 'name'] }],
  })) as MeasurementRow | null;
  if (!row) throw notFound('Measurement');
  const spectrum = row.spectrum ? parseJson<StoredSpectrum>(row.spectrum) : null;
  return { ...toPublic(row), spectrum };
}

/** The stored WAV of a recorded measurement, for listening again. */
export async function getRecording(sheetId: number, id: number): Promise<{ bytes: Buffer; fileName: string; sha256: string }> {
  const row = await Measurement.findOne({ where: { id, sheetId }, attributes: ['id', 'recordingSha256', 'recordingName'] });
  if (!row) throw notFound('Measurement');
  if (!row.recordingSha256) throw new AppError('not_found', 'This measurement was typed in; it has no recording.', 404);
  const sha256 = row.recordingSha256;
  const bytes = await withUploadErrors(() => getContentStore().get(sha256, { verify: true }));
  return { bytes, fileName: row.recordingName ?? 'recording.wav', sha256 };
}

function band(targetHz: number): { low: number; high: number } {
  const { lowHz, highHz } = pluckBandHz({ targetHz });
  return { low: lowHz, high: highHz };
}

function spanStatus(latest: PublicMeasurement | null): SpanStatus {
  if (!latest) return 'unmeasured';
  if (latest.deviationPct < -TARGET_TOLERANCE_PCT) return 'low';
  if (latest.deviationPct > TARGET_TOLERANCE_PCT) return 'high';
  return 'ok';
}

/**
 * The two belts of a crossed-belt (CoreXY) stage are mirror images: the engine lists their spans in the same order
 * (clamp → gantry idler → motor → corner idlers → back to the other clamp), so the i-th span of one corresponds to the
 * i-th span of the other. Other mechanisms have no crossed pair.
 */
function crossedPairs(mechanism: Mechanism, result: DesignResult, spans: SpanSummary[]): CrossedPair[] {
  if (mechanism !== 'corexy' || result.belts.length !== 2) return [];
  const [a, b] = result.belts;
  const byId = new Map(spans.map((s) => [s.spanId, s]));
  const count = Math.min(a.spans.length, b.spans.length);
  const pairs: CrossedPair[] = [];
  for (let i = 0; i < count; i++) {
    const sa = byId.get(a.spans[i].id)!;
    const sb = byId.get(b.spans[i].id)!;
    const ta = sa.latest?.tensionN ?? null;
    const tb = sb.latest?.tensionN ?? null;
    const differencePct = ta !== null && tb !== null && ta + tb > 0 ? (Math.abs(ta - tb) / ((ta + tb) / 2)) * 100 : null;
    pairs.push({
      spanIds: [sa.spanId, sb.spanId],
      labels: [sa.label, sb.label],
      tensionsN: [ta, tb],
      differencePct,
      isMismatch: differencePct !== null && differencePct > CROSSED_BELT_TOLERANCE_PCT,
    });
  }
  return pairs;
}

/**
 * A sheet's measurements, newest first, with each span's target and latest measurement and, for a CoreXY stage,
 * the crossed-belt comparison (mismatch beyond {@link CROSSED_BELT_TOLERANCE_PCT}). Everyone who may read sheets.
 */
export async function listMeasurements(
  actor: PublicUser,
  sheetId: number,
  query: { page: number; pageSize: number },
): Promise<SheetMeasurements> {
  const frozen = await loadFrozenSheet(sheetId);
  // A sheet gathers a handful of plucks per span: read them all (without the spectra) and page in memory.
  const rows = (await Measurement.findAll({
    where: { sheetId },
    include: [{ model: User, as: 'measuredBy', attributes: ['id', 'name'] }],
    attributes: { exclude: ['spectrum'], include: [[Measurement.sequelize!.literal('spectrum IS NOT NULL'), 'hasSpectrumFlag']] },
    order: [
      ['measuredAt', 'DESC'],
      ['id', 'DESC'],
    ],
  })) as MeasurementRow[];
  const all = rows.map(withFlag);
  const latest = new Map<string, PublicMeasurement>();
  const counts = new Map<string, number>();
  for (const m of all) {
    if (!latest.has(m.spanId)) latest.set(m.spanId, m);
    counts.set(m.spanId, (counts.get(m.spanId) ?? 0) + 1);
  }

  const mu = frozen.inputs.belt.linearMassKgPerM;
  const spans: SpanSummary[] = frozen.result.belts.flatMap((belt) =>
    belt.spans.map((span) => {
      const last = latest.get(span.id) ?? null;
      return {
        spanId: span.id,
        beltId: belt.id,
        beltLabel: belt.label,
        label: span.label,
        lengthMm: span.lengthMm,
        fixedLength: span.fixedLength,
        isReference: belt.referenceSpanId === span.id,
        targetFrequencyHz: span.targetFrequencyHz,
        targetBandHz: band(span.targetFrequencyHz),
        targetTensionN: targetTensionN(span, mu),
        latest: last,
        count: counts.get(span.id) ?? 0,
        status: spanStatus(last),
      };
    }),
  );

  return {
    items: all.slice((query.page - 1) * query.pageSize, query.page * query.pageSize),
    total: all.length,
    page: query.page,
    pageSize: query.pageSize,
    sheetId,
    mechanism: frozen.inputs.mechanism,
    spans,
    pairs: crossedPairs(frozen.inputs.mechanism, frozen.result, spans),
    tolerances: { crossedBeltPct: CROSSED_BELT_TOLERANCE_PCT, targetPct: TARGET_TOLERANCE_PCT, source: TOLERANCE_SOURCE },
    allowableTensionN: frozen.inputs.belt.allowableTensionN,
    canRecord: mayRecordMeasurement(actor),
  };
}

/** toPublic for rows read without the spectrum column (its presence comes from a computed flag). */
function withFlag(row: MeasurementRow): PublicMeasurement {
  const flag = row.get('hasSpectrumFlag') as unknown;
  return { ...toPublic(row), hasSpectrum: flag === 1 || flag === true || flag === '1' };
}
