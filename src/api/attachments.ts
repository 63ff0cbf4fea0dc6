import { apiUrl, del, get, upload } from './http';
import type { AttachmentPage, PublicAttachment, TorqueConditions, TorqueCurveInfo } from '@/contracts';

export type { TorqueCurveInfo };

export type { AttachmentPage };
/** A file attached to a design (or the source file of a motor's torque table): src/contracts PublicAttachment. */
export type Attachment = PublicAttachment;

/** File types a design accepts (checked again by the server from the bytes). */
export const ATTACHMENT_ACCEPT = '.pdf,.png,.jpg,.jpeg,.csv,application/pdf,image/png,image/jpeg,text/csv';
/** Largest attachment [bytes]. */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;

/** Lists a design's attachments, newest first. */
export const listAttachments = (designId: number): Promise<AttachmentPage> => get(`/designs/${designId}/attachments`);

/** Attaches a file to a design (its owner or an admin). */
export function uploadAttachment(designId: number, file: File): Promise<Attachment> {
  const form = new FormData();
  form.append('file', file, file.name);
  return upload(`/designs/${designId}/attachments`, form);
}

/** Deletes an attachment. */
export const deleteAttachment = (id: number): Promise<void> => del(`/attachments/${id}`);

/** The download address of an attachment (the browser fetches it itself). */
export const attachmentUrl = (id: number): string => apiUrl(`/attachments/${id}`);

/** Largest torque table file [bytes]. */
export const TORQUE_CSV_MAX_BYTES = 64 * 1024;

/** Reads a motor's torque table with its source file. */
export const getTorqueCurve = (motorId: number): Promise<TorqueCurveInfo> => get(`/parts/motors/${motorId}/torque-curve`);

/**
 * Replaces a motor's torque table with a CSV (admin), with the supply voltage and driver current it was measured at.
 * The file is stored as an attachment of the motor, so the upload lives here with the other file uploads.
 */
export function uploadTorqueCurve(motorId: number, file: File, measuredAt: TorqueConditions): Promise<TorqueCurveInfo> {
  const form = new FormData();
  form.append('supplyV', String(measuredAt.supplyV));
  form.append('currentRmsA', String(measuredAt.currentRmsA));
  form.append('file', file, file.name);
  return upload(`/parts/motors/${motorId}/torque-curve`, form);
}
