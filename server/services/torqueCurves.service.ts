import { AppError, notFound } from '../errors';
import type { UploadedFile } from '../uploads/uploadedFile';
import { Attachment, Part } from '../models';
import { torqueCurveSchema, type TorqueConditions, type TorqueCurveInfo } from '@/contracts';
import { CsvError, parseTorqueCsv, assertTypeMatches, type CsvErrorDetail, type TorquePoint, type TorqueTable } from '../uploads';
import { latestPartAttachment, toPublicAttachment } from './attachments.service';
import { sanitiseFileName, storeWithRows, withUploadErrors } from './fileStore.service';
import { recordAudit } from './audit.service';
import { toPublicMotor } from './parts.service';
import type { PublicUser } from './users.service';

/** Largest torque table [bytes] (64 kB holds far more than the 500 rows accepted). */
export const TORQUE_CSV_MAX_BYTES = 64 * 1024;

export type { TorqueCurveInfo };

/**
 * Where each data row of a torque table sits: the 1-based line of each row in file order and the header cells.
 * Mirrors the parser's skipping (byte-order mark, blank lines, `#` comment lines, rows of empty cells), so that
 * checks made after a successful parse can still name line and column.
 */
function locateRows(text: string): { dataLines: number[]; headerCells: string[] } {
  const lines = text
    .replace(/^\uFEFF/, '')
    .replace(/\r\n?/g, '\n')
    .split('\n');
  const kept: { line: number; text: string }[] = [];
  lines.forEach((t, i) => {
    if (t.trim() === '' || t.trimStart().startsWith('#')) return;
    if (/^[\s,;\t"]*$/.test(t)) return;
    kept.push({ line: i + 1, text: t });
  });
  const header = kept[0]?.text ?? '';
  const counts = [',', ';', '\t'].map((d) => header.split(d).length - 1);
  const delimiter = [',', ';', '\t'][counts.indexOf(Math.max(...counts))];
  const headerCells = header
    .split(delimiter)
    .map((c) => c.trim().replace(/^"|"$/g, ''))
    .filter((c) => c !== '');
  return { dataLines: kept.slice(1).map((k) => k.line), headerCells };
}

/** The header cell naming the torque or the speed column (by its unit), or the plain word. */
function columnName(headerCells: string[], kind: 'speed' | 'torque'): string {
  const isTorque = (c: string) => /torque|newton|ounce|oz|n\s*[·⋅•∙*.-]?\s*c?m\b/i.test(c);
  const torque = headerCells.filter(isTorque);
  const speed = headerCells.filter((c) => !isTorque(c));
  const pick = kind === 'torque' ? torque : speed;
  return pick.length === 1 ? pick[0] : kind;
}

/**
 * Checks a parsed table against what the engine and the shelf accept beyond the parser's own rules: the first
 * torque must be above zero (a motor with no torque at standstill cannot hold the carriage), speeds at most
 * 1000 rev/s and torques at most 100 N·m (the shelf's ranges).
 * @throws CsvError naming line and column
 */
function assertUsableTable(text: string, table: TorqueTable): void {
  const { dataLines, headerCells } = locateRows(text);
  const lineOf = (i: number): number | null => dataLines[i] ?? null;
  const details: CsvErrorDetail[] = [];
  if (!(table.points[0].torqueNm > 0)) {
    details.push({
      line: lineOf(0),
      column: columnName(headerCells, 'torque'),
      message: 'the first torque (the lowest speed) must be greater than 0; a motor holds with it',
    });
  }
  table.points.forEach((p, i) => {
    if (p.speedRevPerS > 1000)
      details.push({
        line: lineOf(i),
        column: columnName(headerCells, 'speed'),
        message: `speed ${p.speedRevPerS.toFixed(1)} rev/s is above the 1000 rev/s the shelf accepts`,
      });
    if (p.torqueNm > 100)
      details.push({
        line: lineOf(i),
        column: columnName(headerCells, 'torque'),
        message: `torque ${p.torqueNm.toFixed(2)} N·m is above the 100 N·m the shelf accepts`,
      });
  });
  if (details.length) throw new CsvError(details.slice(0, 20));
}

/** Rounds to 6 significant figures, so unit conversion leaves no float dust (0.30000000000000004) in the data. */
function tidy(points: TorquePoint[]): TorquePoint[] {
  const r = (v: number) => Number(v.toPrecision(6));
  return points.map((p) => ({ speedRevPerS: r(p.speedRevPerS), torqueNm: r(p.torqueNm) }));
}

/** 404 unless `motorId` is a motor on the shelf (checked before an upload is read). */
export async function assertMotorExists(motorId: number): Promise<void> {
  const exists = await Part.findOne({ where: { id: motorId, kind: 'motor' }, attributes: ['id'] });
  if (!exists) throw notFound('Motor');
}

/**
 * Replaces a shelf motor's torque–speed table with an uploaded CSV (admin), with the supply voltage and driver current
 * it was measured at. The file must be text/CSV by content (415 otherwise); it is parsed and validated (400
 * `invalid_csv` with `details[{line, column, message}]`), then, in one transaction, the motor's `torqueCurve` and
 * `torqueCurveConditions` are set (rev/s, N·m, V, A), the file is kept as an attachment of the motor
 * (content-addressed), and the change is audited. Designs copy both when they pick the motor.
 */
export async function uploadTorqueCurve(
  actor: PublicUser,
  motorId: number,
  file: UploadedFile | null,
  conditions: TorqueConditions,
): Promise<TorqueCurveInfo> {
  await assertMotorExists(motorId);
  if (!file)
    throw new AppError('validation_failed', 'Choose a CSV file with the torque table.', 400, {
      details: [{ path: 'file', message: 'is required (multipart field "file")' }],
    });

  await withUploadErrors(() => assertTypeMatches(file.declaredMime, file.originalName, file.bytes, ['text/csv', 'text/plain']));
  const text = file.bytes.toString('utf8');
  const table = await withUploadErrors(() => {
    const parsed = parseTorqueCsv(text);
    assertUsableTable(text, parsed);
    return parsed;
  });
  const points = tidy(table.points);
  const checked = torqueCurveSchema.safeParse(points);
  if (!checked.success) {
    // Cannot happen after the checks above (same rules); kept so the shelf never stores what its schema refuses.
    throw new AppError('invalid_csv', 'The torque table cannot be used.', 400, {
      details: checked.error.issues.map((i) => ({ path: `file.${i.path.join('.')}`, message: i.message })),
    });
  }
  const fileName = sanitiseFileName(file.originalName, 'text/csv');

  const { part, attachment } = await storeWithRows(file.bytes, async (transaction, sha256) => {
    const row = await Part.findOne({ where: { id: motorId, kind: 'motor' }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound('Motor');
    const data = (typeof row.data === 'string' ? JSON.parse(row.data) : row.data) as Record<string, unknown>;
    const hadTable = Array.isArray(data.torqueCurve) && data.torqueCurve.length > 0;
    row.data = {
      ...data,
      torqueCurve: checked.data,
      torqueCurveConditions: { supplyV: conditions.supplyV, currentRmsA: conditions.currentRmsA },
    };
    row.changed('data', true);
    row.updatedById = actor.id;
    await row.save({ transaction });
    const created = await Attachment.create(
      {
        designId: null,
        partId: motorId,
        uploadedById: actor.id,
        fileName,
        mime: 'text/csv',
        size: file.bytes.length,
        sha256,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'part.torque_curve',
        entity: 'part',
        entityId: motorId,
        fromState: hadTable ? 'table' : 'model',
        toState: 'table',
        reason: `${fileName}: ${points.length} points (${table.sourceUnits.speed}, ${table.sourceUnits.torque}) measured at ${conditions.supplyV} V, ${conditions.currentRmsA} A, SHA-256 ${sha256}`,
      },
      transaction,
    );
    return { part: row, attachment: created };
  });
  const source = await Attachment.findByPk(attachment.id, { include: ['uploadedBy'] });
  return { motor: toPublicMotor(part), file: source ? toPublicAttachment(source, actor, null) : null, sourceUnits: table.sourceUnits };
}

/** A motor with its torque table and the newest uploaded source file (every team member). */
export async function getTorqueCurve(actor: PublicUser, motorId: number): Promise<TorqueCurveInfo> {
  const row = await Part.findOne({ where: { id: motorId, kind: 'motor' } });
  if (!row) throw notFound('Motor');
  const motor = toPublicMotor(row);
  const source = Array.isArray(motor.torqueCurve) && motor.torqueCurve.length > 0 ? await latestPartAttachment(motorId) : null;
  return { motor, file: source ? toPublicAttachment(source, actor, null) : null };
}
