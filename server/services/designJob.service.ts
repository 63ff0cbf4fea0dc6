import type { DesignInput } from '@/engine';
import type { JobUploadResult } from '@/contracts';
import { AppError } from '../errors';
import type { UploadedFile } from '../uploads/uploadedFile';
import { Attachment } from '../models';
import { assertTypeMatches, JOB_CSV_LIMITS, parseJobCsv } from '../uploads';
import { toPublicAttachment } from './attachments.service';
import { sanitiseFileName, storeWithRows, withUploadErrors } from './fileStore.service';
import { recordAudit } from './audit.service';
import { assertInputsChangeable, getDesign, validDocument, writeInputsLocked } from './designs.service';
import type { PublicUser } from './users.service';
import { storedResultsInPool } from '../workers/pool';

/** Largest job file [bytes]. */
export const JOB_CSV_MAX_BYTES = JOB_CSV_LIMITS.maxBytes;

/** 404/403/409 before a job file is read: the design exists, the actor may change it and it is still editable. */
export async function assertMayUploadJob(actor: PublicUser, designId: number): Promise<void> {
  await assertInputsChangeable(actor, designId);
}

/**
 * Replaces a design's job points with an uploaded CSV (x, y and an optional dwell; see docs/models/job-timing.md)
 * and saves the design under the optimistic lock, like any save of the inputs. The file must be CSV/text by content
 * (415 otherwise); a file the parser refuses answers 400 `invalid_csv` with `details[{line, column, message}]`.
 * In one transaction the inputs change (version + 1), the file is kept as an attachment of the design
 * (content-addressed) and the change is audited. The points then travel with the design: export, revisions, sheet.
 * @param version - the design version the client based the upload on (409 when stale)
 */
export async function uploadDesignJob(
  actor: PublicUser,
  designId: number,
  file: UploadedFile | null,
  version: number,
): Promise<JobUploadResult> {
  const current = await assertInputsChangeable(actor, designId, version);
  if (!file)
    throw new AppError('validation_failed', 'Choose a CSV file with the job points.', 400, {
      details: [{ path: 'file', message: 'is required (multipart field "file")' }],
    });
  await withUploadErrors(() => assertTypeMatches(file.declaredMime, file.originalName, file.bytes, ['text/csv', 'text/plain']));
  const table = await withUploadErrors(() => parseJobCsv(file.bytes.toString('utf8')));
  const document: DesignInput = validDocument({ ...current, job: { points: table.points } });
  const stored = await storedResultsInPool(document, 'inputs');
  const fileName = sanitiseFileName(file.originalName, 'text/csv');
  const units = `x ${table.sourceUnits.x}, y ${table.sourceUnits.y}${table.sourceUnits.dwell ? `, dwell ${table.sourceUnits.dwell}` : ''}`;

  const attachment = await storeWithRows(file.bytes, async (transaction, sha256) => {
    await writeInputsLocked(actor, designId, version, document, stored, transaction);
    const created = await Attachment.create(
      { designId, partId: null, uploadedById: actor.id, fileName, mime: 'text/csv', size: file.bytes.length, sha256 },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'design.job_upload',
        entity: 'design',
        entityId: designId,
        reason: `${fileName}: ${table.points.length} points (${units}), SHA-256 ${sha256}`,
      },
      transaction,
    );
    return created;
  });
  const source = await Attachment.findByPk(attachment.id, { include: ['uploadedBy'] });
  const design = await getDesign(actor, designId);
  return {
    design,
    job: { pointCount: table.points.length, sourceUnits: table.sourceUnits },
    file: source ? toPublicAttachment(source, actor, { ownerId: design.owner.id }) : null,
  };
}
