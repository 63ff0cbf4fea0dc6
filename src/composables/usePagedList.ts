import { onMounted, ref, shallowRef, watch, type Ref, type ShallowRef } from 'vue';
import { errorMessage } from '@/utils/message';

/** One page as the list endpoints answer it. */
export interface PageAnswer<T> {
  items: T[];
  total: number;
}

/** State of a server-paged list: rows of the current page and how loading went. */
export interface PagedList<T> {
  rows: ShallowRef<T[]>;
  total: Ref<number>;
  page: Ref<number>;
  isLoading: Ref<boolean>;
  hasLoaded: Ref<boolean>;
  loadError: Ref<string | null>;
  /** (Re)loads the current page. */
  load: () => Promise<void>;
}

/**
 * A list paged on the server: loads on mount and whenever the page changes, and ignores an answer that arrives
 * after a newer request was sent (a slow first page must not overwrite the second).
 * @param fetchPage - asks the server for one page (1-based)
 * @param failureMessage - what to show when loading fails and the error carries no message of its own
 */
export function usePagedList<T>(fetchPage: (page: number) => Promise<PageAnswer<T>>, failureMessage: string): PagedList<T> {
  const rows = shallowRef<T[]>([]);
  const total = ref(0);
  const page = ref(1);
  const isLoading = ref(false);
  const hasLoaded = ref(false);
  const loadError = ref<string | null>(null);
  let ticket = 0;

  async function load(): Promise<void> {
    const mine = ++ticket;
    isLoading.value = true;
    try {
      const answer = await fetchPage(page.value);
      if (mine !== ticket) return;
      rows.value = answer.items;
      total.value = answer.total;
      loadError.value = null;
    } catch (err) {
      if (mine === ticket) loadError.value = errorMessage(err, failureMessage);
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
