import { listRevisions } from '@/api/revisions';
import { usePagedList } from '@/composables/usePagedList';

/** Rows per page of the review desk. */
export const REVIEW_DESK_PAGE_SIZE = 20;

/**
 * State of the Review desk: the revisions waiting for review, oldest submission first (the server's order),
 * one page at a time.
 */
export function useReviewDesk() {
  return usePagedList(
    (page) => listRevisions({ status: 'in_review', page, pageSize: REVIEW_DESK_PAGE_SIZE }),
    'The review desk could not be loaded.',
  );
}

/**
 * How long something has waited, in words ("3 days", "5 hours", "just now").
 * @param iso - ISO 8601 timestamp
 * @param now - the current time [ms since epoch]
 */
export function waitingFor(iso: string, now = Date.now()): string {
  const ms = Math.max(0, now - Date.parse(iso));
  const hours = Math.floor(ms / 3_600_000);
  if (hours < 1) return 'less than an hour';
  if (hours < 24) return `${hours} hour${hours === 1 ? '' : 's'}`;
  const days = Math.floor(hours / 24);
  return `${days} day${days === 1 ? '' : 's'}`;
}
