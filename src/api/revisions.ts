import type { UnitSystem } from '@/format';
import type { CommentItem, DesignStatus, Page, RevisionDetail, RevisionDiff, RevisionListItem, RevisionListQuery } from '@/contracts';
import { get, post } from './http';

// Request and answer shapes come from the contract (src/contracts); views import them from here.
export type {
  InputChange,
  PersonRef,
  ResultChange,
  RevisionDetail,
  RevisionDiff,
  RevisionListItem,
  RevisionListQuery,
  RevisionStatus,
  RevisionSummaryFigures,
} from '@/contracts';
/** One comment of a revision's discussion (src/contracts CommentItem). */
export type RevisionComment = CommentItem;

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
