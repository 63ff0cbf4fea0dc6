import type { Page, SheetDetail, SheetListItem } from '@/contracts';
import { createHash } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import type { DesignInput, DesignResult, Mechanism } from '@/engine';
import { isUnitSystem, type UnitSystem } from '@/format';
import { getConfig } from '../config';
import { AppError, notFound } from '../errors';
import { Revision, Sheet, User, type SheetPaper } from '../models';
import { getContentStore } from '../storage';
import { ContentStoreError } from '../uploads';
import { renderSheetsInPool } from '../workers/pool';
import { recordAudit } from './audit.service';
import { parseJson } from './storedJson';
import type { PublicUser } from './users.service';

/**
 * Design sheets: rendered once, when a revision is approved, from the FROZEN revision (its stored inputs and
 * result, never the design's live inputs), in A4 and US Letter. Both files are stored with the SHA-256 of their
 * bytes and served unchanged forever; nothing re-renders or modifies a sheet (a database trigger refuses updates).
 * A sheet is superseded when a later revision of the same design has been approved.
 */

/** What approval hands over: the frozen revision and the approval printed on the sheet. */
export type SheetSource = {
  designName: string;
  revisionNumber: number;
  mechanism: Mechanism;
  designer: { name: string; email: string };
  approval: { reviewerName: string; approvedAt: Date; comment: string; justification?: string | null };
  inputs: DesignInput;
  result: DesignResult;
  fingerprint: string;
  /** Unit system the sheet prints in (chosen by the designer at submission). */
  units?: UnitSystem;
};

/** Rendered bytes and their hashes, ready to store. */
export type RenderedSheet = { a4: Buffer; a4Sha256: string; letter: Buffer; letterSha256: string };

/** SHA-256 (hex) of bytes. */
export function sha256Hex(bytes: Buffer): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** "Bench dispensing stage" → "bench-dispensing-stage" (ASCII, at most 80 characters; "design" when nothing is left). */
export function slugify(name: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80)
    .replace(/-+$/g, '');
  return slug || 'design';
}

/** Download name of a sheet file: "<design-slug>-rev<N>.pdf" for A4, "…-rev<N>-letter.pdf" for US Letter. */
export function sheetFileName(designName: string, revisionNumber: number, paper: SheetPaper): string {
  return `${slugify(designName)}-rev${revisionNumber}${paper === 'LETTER' ? '-letter' : ''}.pdf`;
}

/**
 * Renders the sheet of a frozen revision in A4 and US Letter (one after the other: pdfmake is a process-wide
 * singleton). The renderer fixes the PDF dates to the approval time, so the bytes depend on the revision and
 * the approval only.
 */
export async function renderSheetFiles(source: SheetSource): Promise<RenderedSheet> {
  // Loaded here, not at the top: the API server renders in the PDF pool (below), and the renderer's modules (about
  // 8 MB of heap) would otherwise sit on the event loop's heap, where every major garbage collection marks them.
  const { renderSheet } = await import('../sheet/renderSheet');
  const base = { ...source, appUrl: getConfig().appUrl };
  const a4 = await renderSheet({ ...base, paper: 'A4' });
  const letter = await renderSheet({ ...base, paper: 'LETTER' });
  return { a4, a4Sha256: sha256Hex(a4), letter, letterSha256: sha256Hex(letter) };
}

/**
 * {@link renderSheetFiles} in the PDF worker pool: an approval renders two sheets (about a second of CPU), which on
 * the event loop would stall every other request meanwhile.
 */
export async function renderSheetFilesOffThread(source: SheetSource): Promise<RenderedSheet> {
  return renderSheetsInPool({ ...source, appUrl: getConfig().appUrl });
}

/**
 * Writes the row of a rendered sheet for an approved revision (inside the approval's transaction). The PDF bytes go
 * to the content store under their SHA-256 in the same transaction: run it through `storeWithRowsMaking()`
 * (fileStore.service), which registers and puts them. @returns the sheet id
 */
export async function storeSheet(
  input: { revisionId: number; designId: number; approvedById: number; approvedAt: Date; comment: string; rendered: RenderedSheet },
  transaction: Transaction,
): Promise<number> {
  const row = await Sheet.create(
    {
      revisionId: input.revisionId,
      designId: input.designId,
      approvedById: input.approvedById,
      approvedAt: input.approvedAt,
      comment: input.comment,
      a4Pdf: null,
      a4Sha256: input.rendered.a4Sha256,
      a4Size: input.rendered.a4.length,
      letterPdf: null,
      letterSha256: input.rendered.letterSha256,
      letterSize: input.rendered.letter.length,
    },
    { transaction },
  );
  return row.id;
}

type SheetRow = Sheet & { revision?: Revision & { author?: User | null }; approvedBy?: User | null };

const META_ATTRIBUTES = { exclude: ['a4Pdf', 'letterPdf'] };
const includes = (withResult: boolean) => [
  {
    model: Revision,
    as: 'revision',
    attributes: [
      'id',
      'number',
      'inputs',
      'summary',
      'fingerprint',
      'engineVersion',
      'authorId',
      'approvalJustification',
      'sheetUnits',
      ...(withResult ? ['result'] : []),
    ],
    include: [{ model: User, as: 'author', attributes: ['id', 'name'] }],
  },
  { model: User, as: 'approvedBy', attributes: ['id', 'name'] },
];

/** The newest approved revision (number, sheet id) of each design among `designIds`. */
export async function latestSheets(designIds: number[]): Promise<Map<number, { sheetId: number; revisionNumber: number }>> {
  const latest = new Map<number, { sheetId: number; revisionNumber: number }>();
  if (!designIds.length) return latest;
  const rows = (await Sheet.findAll({
    where: { designId: { [Op.in]: designIds } },
    attributes: ['id', 'designId'],
    include: [{ model: Revision, as: 'revision', attributes: ['number'] }],
  })) as SheetRow[];
  for (const row of rows) {
    const number = row.revision?.number ?? 0;
    const current = latest.get(row.designId);
    if (!current || number > current.revisionNumber) latest.set(row.designId, { sheetId: row.id, revisionNumber: number });
  }
  return latest;
}

function toListItem(row: SheetRow, latest: Map<number, { sheetId: number; revisionNumber: number }>): SheetListItem {
  const revision = row.revision!;
  const inputs = parseJson<{ name: string; mechanism: Mechanism }>(revision.inputs);
  const newest = latest.get(row.designId);
  const isSuperseded = !!newest && newest.revisionNumber > revision.number;
  return {
    id: row.id,
    revisionId: revision.id,
    revisionNumber: revision.number,
    design: { id: row.designId, name: inputs.name, mechanism: inputs.mechanism },
    designer: { id: revision.authorId, name: revision.author?.name ?? '' },
    approvedBy: { id: row.approvedById, name: row.approvedBy?.name ?? '' },
    approvedAt: new Date(row.approvedAt).toISOString(),
    comment: row.comment,
    justification: revision.approvalJustification ?? null,
    units: isUnitSystem(revision.sheetUnits) ? revision.sheetUnits : 'metric',
    checks: parseJson<{ checks?: { ok: number; warn: number; fail: number } }>(revision.summary)?.checks ?? { ok: 0, warn: 0, fail: 0 },
    sha256: row.a4Sha256,
    files: [
      { paper: 'A4', sha256: row.a4Sha256, size: row.a4Size, fileName: sheetFileName(inputs.name, revision.number, 'A4') },
      { paper: 'LETTER', sha256: row.letterSha256, size: row.letterSize, fileName: sheetFileName(inputs.name, revision.number, 'LETTER') },
    ],
    fingerprint: revision.fingerprint,
    engineVersion: revision.engineVersion,
    isSuperseded,
    supersededBy: isSuperseded ? newest : null,
  };
}

/**
 * Lists approved sheets, newest approval first, optionally of one design or only the current (not superseded)
 * ones. Makers, designers, reviewers and admins.
 */
export async function listSheets(
  _actor: PublicUser,
  query: { page: number; pageSize: number; designId?: number; current?: boolean },
): Promise<Page<SheetListItem>> {
  const where: Record<string, unknown> = {};
  if (query.designId !== undefined) where.designId = query.designId;
  if (query.current) {
    // A sheet is current when no sheet of the same design belongs to a later revision.
    where.id = {
      [Op.notIn]: Sheet.sequelize!.literal(
        '(SELECT s1.id FROM sheets s1 JOIN revisions r1 ON r1.id = s1.revision_id ' +
          'JOIN sheets s2 ON s2.design_id = s1.design_id JOIN revisions r2 ON r2.id = s2.revision_id WHERE r2.number > r1.number)',
      ),
    };
  }
  const { rows, count } = (await Sheet.findAndCountAll({
    where,
    attributes: META_ATTRIBUTES,
    include: includes(false),
    order: [
      ['approvedAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
    distinct: true,
  })) as { rows: SheetRow[]; count: number };
  const latest = await latestSheets([...new Set(rows.map((r) => r.designId))]);
  return { items: rows.map((row) => toListItem(row, latest)), total: count, page: query.page, pageSize: query.pageSize };
}

/** One sheet with the build figures of its frozen revision. */
export async function getSheet(_actor: PublicUser, id: number): Promise<SheetDetail> {
  const row = (await Sheet.findByPk(id, { attributes: META_ATTRIBUTES, include: includes(true) })) as SheetRow | null;
  if (!row || !row.revision) throw notFound('Sheet');
  const latest = await latestSheets([row.designId]);
  const inputs = parseJson<DesignInput>(row.revision.inputs);
  const result = parseJson<DesignResult>(row.revision.result);
  return {
    ...toListItem(row, latest),
    build: {
      stepsPerMm: result.drive.stepsPerMm,
      travel: { xMm: result.travel.xMm, yMm: result.travel.yMm },
      pretensionN: inputs.pretensionN,
      parking: { xMm: result.parking.xMm, yMm: result.parking.yMm },
      belts: result.belts.map((b) => ({
        id: b.id,
        label: b.label,
        cutLengthMm: b.cutLengthMm,
        loopTeeth: b.loopTeeth,
        spans: b.spans.map((s) => ({
          id: s.id,
          label: s.label,
          lengthMm: s.lengthMm,
          targetFrequencyHz: s.targetFrequencyHz,
          fixedLength: s.fixedLength,
        })),
      })),
    },
  };
}

/**
 * The stored PDF bytes of a sheet in one paper size, with their stored SHA-256 and download name. Bytes come from the
 * content store or, for sheets published before sheets moved there, from the row. Either way they are hashed again
 * on every read: bytes that no longer match the SHA-256 recorded at approval are never served — the answer is a 500
 * and the audit log records the mismatch (issue 12, item 7).
 * @throws 404 for an unknown sheet; 500 `sheet_missing` when the bytes are gone; 500 `sheet_integrity_failed` when
 *   they no longer match their hash
 */
export async function getSheetPdf(
  actor: PublicUser,
  id: number,
  paper: SheetPaper,
): Promise<{ bytes: Buffer; sha256: string; fileName: string }> {
  const column = paper === 'A4' ? 'a4Pdf' : 'letterPdf';
  const hash = paper === 'A4' ? 'a4Sha256' : 'letterSha256';
  const row = (await Sheet.findByPk(id, {
    attributes: ['id', column, hash],
    include: [{ model: Revision, as: 'revision', attributes: ['number', 'inputs'] }],
  })) as SheetRow | null;
  if (!row || !row.revision) throw notFound('Sheet');
  const sha256 = row[hash];
  let bytes = row[column];
  if (!Buffer.isBuffer(bytes)) {
    try {
      // Not the store's own check: a mismatch must reach the audit below, from either source alike.
      bytes = await getContentStore().get(sha256, { verify: false });
    } catch (err) {
      if (err instanceof ContentStoreError) {
        throw new AppError('sheet_missing', 'The stored sheet could not be read.', 500, { isOperational: false, cause: err });
      }
      throw err;
    }
  }
  const actual = sha256Hex(bytes);
  if (actual !== sha256) {
    await recordAudit({
      actorId: actor.id,
      action: 'sheet.integrity_failed',
      entity: 'sheet',
      entityId: id,
      reason: `${paper} PDF: recorded SHA-256 ${sha256}, stored bytes hash to ${actual}; not served`,
    });
    throw new AppError(
      'sheet_integrity_failed',
      'The stored design sheet does not match the SHA-256 recorded when it was approved, so it is not served. An admin has been told through the audit log.',
      500,
      { isOperational: false },
    );
  }
  const { name } = parseJson<{ name: string }>(row.revision.inputs);
  return { bytes, sha256, fileName: sheetFileName(name, row.revision.number, paper) };
}
