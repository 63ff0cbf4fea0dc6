import type { UnitSystem } from '@/format';
import type { Mechanism } from '@/engine';
import { apiUrl, get } from './http';
import type { PersonRef } from './revisions';
import type { Page } from './types';

/** Paper sizes every sheet is stored in. */
import type { SheetPaper } from '@/contracts';

export type { SheetPaper };

/** One stored PDF of a sheet. */
export interface SheetFile {
  paper: SheetPaper;
  /** SHA-256 of the stored bytes (hex). */
  sha256: string;
  /** Size in bytes. */
  size: number;
  fileName: string;
}

/** A sheet in the Sheets table. */
export interface SheetListItem {
  id: number;
  revisionId: number;
  revisionNumber: number;
  design: { id: number; name: string; mechanism: Mechanism };
  designer: PersonRef;
  approvedBy: PersonRef;
  /** ISO 8601 timestamp */
  approvedAt: string;
  comment: string;
  /** Why the reviewer approved although a check failed (null when nothing failed). */
  justification: string | null;
  /** Unit system the PDF is printed in (chosen by the designer at submission). */
  units: UnitSystem;
  /** The frozen revision's check counts. */
  checks: { ok: number; warn: number; fail: number };
  /** SHA-256 of the A4 PDF. */
  sha256: string;
  files: SheetFile[];
  /** SHA-256 of the revision's frozen inputs and results (printed in the sheet's footer). */
  fingerprint: string;
  engineVersion: string;
  isSuperseded: boolean;
  supersededBy: { sheetId: number; revisionNumber: number } | null;
}

/** One span to pluck and its target frequency. */
export interface SheetSpan {
  id: string;
  label: string;
  lengthMm: number;
  targetFrequencyHz: number;
  fixedLength: boolean;
}

/** A sheet with the build figures of its revision. */
export interface SheetDetail extends SheetListItem {
  build: {
    stepsPerMm: number;
    travel: { xMm: number; yMm: number };
    pretensionN: number;
    parking: { xMm: number; yMm: number };
    belts: { id: string; label: string; cutLengthMm: number; loopTeeth: number; spans: SheetSpan[] }[];
  };
}

/** Query of the Sheets list. */
export interface SheetListQuery {
  page?: number;
  pageSize?: number;
  designId?: number;
  /** Only sheets not superseded by a later approval. */
  current?: boolean;
}

/** Lists approved sheets, newest approval first. */
export const listSheets = (query: SheetListQuery = {}): Promise<Page<SheetListItem>> =>
  get('/sheets', { ...query, current: query.current ? 'true' : undefined });

/** Reads one sheet with its build figures. */
export const getSheet = (id: number): Promise<SheetDetail> => get(`/sheets/${id}`);

/** The download address of a sheet's PDF (the browser fetches it itself). */
export const sheetPdfUrl = (id: number, paper: SheetPaper = 'A4'): string =>
  apiUrl(`/sheets/${id}/pdf`, { paper: paper === 'A4' ? 'a4' : 'letter' });
