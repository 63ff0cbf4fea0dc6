import type { DesignInput, DesignResult, Mechanism } from '@/engine';
import type { QuantityKey, UnitSystem } from '@/format';
import type { PersonRef } from './common';
import type { DesignStatus, RevisionStatus } from './enums';

/** Figures of a revision's frozen result, stored with it for lists. */
export type RevisionSummaryFigures = {
  checks: { ok: number; warn: number; fail: number };
  stepsPerMm: number;
  travel: { xMm: number; yMm: number };
  worstAccelMPerS2: number;
  lowestFrequencyHz: number;
};

/** A revision in lists: no inputs or result, a few frozen figures instead. */
export type RevisionListItem = {
  id: number;
  designId: number;
  /** 1, 2, … per design */
  number: number;
  status: RevisionStatus;
  /** The design's name as frozen in this revision. */
  name: string;
  mechanism: Mechanism;
  design: { id: number; name: string; status: DesignStatus; owner: PersonRef };
  author: PersonRef;
  /** ISO 8601 timestamp */
  submittedAt: string;
  decidedBy: PersonRef | null;
  decidedAt: string | null;
  /** Why it was returned (status `returned`), else null. */
  returnReason: string | null;
  /** The reviewer's comment on approval (status `approved`), else null. */
  approvalComment: string | null;
  /** Why the reviewer approved although a check failed (approved with failures only), else null. */
  approvalJustification: string | null;
  /** Unit system the design sheet is printed in (chosen by the designer at submission). */
  sheetUnits: UnitSystem;
  sheetId: number | null;
  engineVersion: string;
  /** SHA-256 of the canonical JSON of the frozen inputs and result. */
  fingerprint: string;
  summary: RevisionSummaryFigures;
  /** The signed-in user authored it or owns the design: they cannot approve or return it. */
  isOwn: boolean;
};

/** One revision with its frozen inputs and result, and what the signed-in user may do with it. */
export type RevisionDetail = RevisionListItem & {
  inputs: DesignInput;
  result: DesignResult;
  previousRevisionId: number | null;
  permissions: { canDecide: boolean; canComment: boolean; canWithdraw: boolean };
};

/** One input that differs; `old` is null for a new path (and for every path of a first revision). */
export type InputChange = { path: string; change: 'added' | 'removed' | 'changed'; old: unknown; new: unknown };

/**
 * One key result, old and new. `unit` names the stored unit for programs; `quantity` and `stored` let a reader's
 * client show the numbers in their unit system (format layer, `@/format`).
 */
export type ResultChange = {
  key: string;
  label: string;
  /** Unit of `old` and `new` as stored (kept for programs; people read them through `quantity`). */
  unit: string;
  /** What the numbers measure, so they are shown in the reader's unit system (null for counts). */
  quantity: QuantityKey | null;
  /** mathjs unit string of `old` and `new`. */
  stored: string;
  old: number | null;
  new: number | null;
  isChanged: boolean;
};

/** The answer of GET /api/revisions/:id/diff: what changed since the previous revision of the same design. */
export type RevisionDiff = {
  revisionId: number;
  number: number;
  /** Engine that computed this revision's frozen result. */
  engineVersion: string;
  previous: { id: number; number: number; status: RevisionStatus; engineVersion: string } | null;
  /** Changed inputs only (all inputs, as `added`, for a first revision). */
  inputs: InputChange[];
  /** Every key result, with `isChanged` marking those that moved. */
  results: ResultChange[];
};

/** One comment of a revision's discussion; `parentId` is the comment it answers (null for a new thread). */
export type CommentItem = {
  id: number;
  revisionId: number;
  parentId: number | null;
  author: PersonRef & { roles: string[] };
  body: string;
  /** ISO 8601 timestamp */
  createdAt: string;
};
