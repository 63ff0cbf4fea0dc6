import { onMounted, ref, shallowRef, watch } from 'vue';
import { listRevisions, type RevisionListItem } from '@/api/revisions';
import { errorMessage } from '@/utils/message';

/** Rows per page of the review desk. */
export const REVIEW_DESK_PAGE_SIZE = 20;

/**
 * State of the Review desk: the revisions waiting for review, oldest submission first (the server's order),
 * one page at a time.
 */
export function useReviewDesk() {
  const rows = shallowRef<RevisionListItem[]>([]);
  const total = ref(0);
  const page = ref(1);
  const isLoading = ref(false);
  const hasLoaded = ref(false);
  const loadError = ref<string | null>(null);
  let ticket = 0;

  /** (Re)loads the current page. */
  async function load(): Promise<void> {
    const mine = ++ticket;
    isLoading.value = true;
    try {
      const answer = await listRevisions({ status: 'in_review', page: page.value, pageSize: REVIEW_DESK_PAGE_SIZE });
      if (mine !== ticket) return;
      rows.value = answer.items;
      total.value = answer.total;
      loadError.value = null;
    } catch (err) {
      if (mine === ticket) loadError.value = errorMessage(err, 'The review desk could not be loaded.');
    } finally {
      if (mine === ticket) {
        isLoading.value = false;
        hasLoaded.value = true;
      }
    }
  }

  watch(page, () => void load());
  onMounted(() => void load());

  return { rows, total, page, isLoading, hasLoaded, loadError, load };
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
