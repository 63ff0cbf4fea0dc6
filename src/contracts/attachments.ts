import type { Page, PersonRef } from './common';

/** A file attached to a design (or the source file of a motor's torque table), as the API shows it. */
export type PublicAttachment = {
  id: number;
  designId: number | null;
  partId: number | null;
  fileName: string;
  /** Type found from the file's bytes. */
  mime: string;
  size: number;
  sha256: string;
  uploadedBy: PersonRef | null;
  /** ISO 8601 timestamp */
  createdAt: string;
  /** Download address (GET). */
  url: string;
  /** Whether the signed-in user may delete it (the server decides). */
  canDelete: boolean;
};

/** A design's attachments, plus whether the signed-in user may add one. */
export type AttachmentPage = Page<PublicAttachment> & { canUpload: boolean };
