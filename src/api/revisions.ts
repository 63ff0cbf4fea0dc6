import type { QuantityKey, UnitSystem } from '@/format';
import type { DesignInput, DesignResult, Mechanism } from '@/engine';
import type { DesignStatus } from './designs';
import { get, post } from './http';
import type { Page } from './types';

/** Review states of a revision: only `in_review` still changes. */
import type { RevisionStatus } from '@/contracts';

export type { RevisionStatus };

/** Someone named in an answer. */
export interface PersonRef {
  id: number;
  name: string;
}

/** Figures of a revision's frozen result, for lists. */
export interface RevisionSummaryFigures {
  checks: { ok: number; warn: number; fail: number };
  stepsPerMm: number;
  travel: { xMm: number; yMm: number };
  worstAccelMPerS2: number;
  lowestFrequencyHz: number;
}

/** A revision in lists (no inputs or result). */
export interface RevisionListItem {
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
  /** Why the reviewer returned it (status `returned`). */
  returnReason: string | null;
  /** The reviewer's comment on approval (status `approved`). */
  approvalComment: string | null;
  /** Why the reviewer approved although a check failed, else null. */
  approvalJustification: string | null;
  /** Unit system the design sheet is printed in. */
  sheetUnits: UnitSystem;
  sheetId: number | null;
  engineVersion: string;
  /** SHA-256 of the frozen inputs and results. */
  fingerprint: string;
  summary: RevisionSummaryFigures;
  /** The signed-in user wrote it or owns the design (so cannot decide it). */
  isOwn: boolean;
}

/** One revision with its frozen inputs and result, and what the signed-in user may do. */
export interface RevisionDetail extends RevisionListItem {
  inputs: DesignInput;
  result: DesignResult;
  previousRevisionId: number | null;
  permissions: { canDecide: boolean; canComment: boolean; canWithdraw: boolean };
}

/** One changed input: dotted path, old and new value. */
export interface InputChange {
  path: string;
  change: 'added' | 'removed' | 'changed';
  old: unknown;
  new: unknown;
}

/** One key result of two revisions side by side. */
export interface ResultChange {
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
}

/** What changed since the previous revision of the same design. */
export interface RevisionDiff {
  revisionId: number;
  number: number;
  /** Engine that computed this revision's frozen result. */
  engineVersion: string;
  previous: { id: number; number: number; status: RevisionStatus; engineVersion: string } | null;
  inputs: InputChange[];
  results: ResultChange[];
}

/** One comment of a revision's discussion; `parentId` is the comment it answers. */
export interface RevisionComment {
  id: number;
  revisionId: number;
  parentId: number | null;
  author: PersonRef & { roles: string[] };
  body: string;
  /** ISO 8601 timestamp */
  createdAt: string;
}

/** Query of the review desk list. */
export interface RevisionListQuery {
  /** One status or a comma-separated list, e.g. "in_review". */
  status?: string;
  designId?: number;
  page?: number;
  pageSize?: number;
}

/** Lists revisions (reviewers and admins), oldest submission first. */
export const listRevisions = (query: RevisionListQuery = {}): Promise<Page<RevisionListItem>> => get('/revisions', { ...query });

/** Reads one revision with its frozen inputs and result. */
export const getRevision = (id: number): Promise<RevisionDetail> => get(`/revisions/${id}`);

/** The diff of a revision against the previous one of the same design. */
export const getRevisionDiff = (id: number): Promise<RevisionDiff> => get(`/revisions/${id}/diff`);

/** The discussion of a revision, oldest first. */
export const listComments = (id: number): Promise<Page<RevisionComment>> => get(`/revisions/${id}/comments`);

/** Adds a comment, or a reply when `parentId` is given. */
export const addComment = (id: number, body: string, parentId?: number | null): Promise<RevisionComment> =>
  post(`/revisions/${id}/comments`, parentId ? { body, parentId } : { body });

/**
 * Approves a revision; the server renders and publishes its design sheet. `justification` is required when a
 * check of the revision failed (400 otherwise).
 */
export const approveRevision = (
  id: number,
  comment: string,
  justification = '',
): Promise<{ revision: RevisionDetail; sheet: { id: number; sha256: string } }> =>
  post(`/revisions/${id}/approve`, justification ? { comment, justification } : { comment });

/** Returns a revision to its designer with a reason (required). */
export const returnRevision = (id: number, reason: string): Promise<RevisionDetail> => post(`/revisions/${id}/return`, { reason });

/**
 * Submits a design for review; `version` is the design version the designer sees, `sheetUnits` the unit system
 * its design sheet will be printed in.
 */
export const submitDesign = (designId: number, version?: number, sheetUnits?: UnitSystem): Promise<RevisionDetail> =>
  post(`/designs/${designId}/submit`, { ...(version === undefined ? {} : { version }), ...(sheetUnits ? { sheetUnits } : {}) });

/** Withdraws the design's revision in review; the design becomes a draft again. */
export const withdrawDesign = (designId: number): Promise<RevisionDetail> => post(`/designs/${designId}/withdraw`, {});

/** Reopens an approved design as a draft for a new revision (its sheets stay). */
export const reopenDesign = (designId: number): Promise<{ id: number; status: DesignStatus }> => post(`/designs/${designId}/reopen`, {});

/** The revision history of a design, newest first (with return reasons and approval comments). */
export const listDesignRevisions = (designId: number): Promise<Page<RevisionListItem>> => get(`/designs/${designId}/revisions`);
