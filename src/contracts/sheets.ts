import type { Mechanism } from '@/engine';
import type { UnitSystem } from '@/format';
import type { PersonRef } from './common';
import type { SheetPaper } from './enums';

/** One stored PDF of a sheet. */
export type SheetFile = {
  paper: SheetPaper;
  /** SHA-256 of the stored bytes (hex). */
  sha256: string;
  /** Size in bytes. */
  size: number;
  fileName: string;
};

/** A sheet in the Sheets table. */
export type SheetListItem = {
  id: number;
  revisionId: number;
  revisionNumber: number;
  /** The design as frozen in the revision (name and mechanism printed on the sheet). */
  design: { id: number; name: string; mechanism: Mechanism };
  designer: PersonRef;
  approvedBy: PersonRef;
  /** ISO 8601 timestamp */
  approvedAt: string;
  comment: string;
  /** Why the reviewer approved although a check failed (null when nothing failed). */
  justification: string | null;
  /** Unit system the sheet is printed in (chosen by the designer at submission). */
  units: UnitSystem;
  /** The frozen revision's check counts. */
  checks: { ok: number; warn: number; fail: number };
  /** SHA-256 of the A4 PDF (the default download). */
  sha256: string;
  files: SheetFile[];
  /** The revision's fingerprint (SHA-256 of its frozen inputs and results), printed in the sheet's footer. */
  fingerprint: string;
  engineVersion: string;
  isSuperseded: boolean;
  /** The newest approved sheet of the same design, when this one is superseded. */
  supersededBy: { sheetId: number; revisionNumber: number } | null;
};

/** One span to pluck, with its target (for the maker's tension check). */
export type SheetSpan = { id: string; label: string; lengthMm: number; targetFrequencyHz: number; fixedLength: boolean };

/** A sheet with the build figures a maker needs on screen. */
export type SheetDetail = SheetListItem & {
  build: {
    stepsPerMm: number;
    travel: { xMm: number; yMm: number };
    pretensionN: number;
    parking: { xMm: number; yMm: number };
    belts: { id: string; label: string; cutLengthMm: number; loopTeeth: number; spans: SheetSpan[] }[];
  };
};
