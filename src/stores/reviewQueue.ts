import { ref } from 'vue';
import { defineStore } from 'pinia';
import { listRevisions } from '@/api/revisions';

/**
 * How many revisions wait on the Review desk, for the count beside "Review desk" in the navigation. Read for
 * reviewers and admins when the app opens and after every navigation (one small request: a page of one row).
 */
export const useReviewQueueStore = defineStore('reviewQueue', () => {
  /** Revisions in review, or null before the first answer (or when it failed). */
  const waiting = ref<number | null>(null);
  let ticket = 0;

  /** Asks the server again; failures keep the last count (the desk itself reports errors). */
  async function refresh(): Promise<void> {
    const mine = ++ticket;
    try {
      const page = await listRevisions({ status: 'in_review', page: 1, pageSize: 1 });
      if (mine === ticket) waiting.value = page.total;
    } catch {
      // keep the last count
    }
  }

  /**
   * Sets the count from a list the caller already loaded (the Review desk), sparing a request.
   * @param total - revisions in review
   */
  function set(total: number): void {
    ticket++;
    waiting.value = total;
  }

  return { waiting, refresh, set };
});
