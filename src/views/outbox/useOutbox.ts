import { computed, ref } from 'vue';
import { storeToRefs } from 'pinia';
import { listOutbox, type OutboxMail } from '@/api/outbox';
import { isApiError } from '@/api/http';
import { useHealthStore } from '@/stores/health';
import { errorMessage } from '@/utils/message';

/** E-mails per page of the Outbox list. */
export const OUTBOX_PAGE_SIZE = 25;

/**
 * State and actions of the Outbox screen (admin; development and test): the e-mails the local mail
 * catcher received, newest first, and the one open in the reader.
 * @returns `mails`, `total`, `page`, `selected`, `isLoading`, `loadError`, `isUnavailable`, `load()`, `select()`, `setPage()`
 */
export function useOutbox() {
  const health = useHealthStore();
  const { health: healthInfo } = storeToRefs(health);

  const mails = ref<OutboxMail[]>([]);
  const total = ref(0);
  const page = ref(1);
  const selectedId = ref<OutboxMail['id'] | null>(null);
  const isLoading = ref(false);
  const loadError = ref('');
  /** The server does not keep caught e-mails (production) and answered 404. */
  const isNotServed = ref(false);

  const selected = computed(() => mails.value.find((m) => m.id === selectedId.value) ?? null);
  const isUnavailable = computed(() => isNotServed.value || healthInfo.value?.outbox === false);

  async function load(): Promise<void> {
    isLoading.value = true;
    loadError.value = '';
    try {
      const result = await listOutbox({ page: page.value, pageSize: OUTBOX_PAGE_SIZE });
      mails.value = result.items;
      total.value = result.total;
      isNotServed.value = false;
      if (!selected.value) selectedId.value = result.items[0]?.id ?? null;
    } catch (err) {
      if (isApiError(err) && err.status === 404) isNotServed.value = true;
      else loadError.value = errorMessage(err, 'The outbox could not be loaded.');
    } finally {
      isLoading.value = false;
    }
  }

  function select(mail: OutboxMail): void {
    selectedId.value = mail.id;
  }

  function setPage(next: number): void {
    page.value = next;
    selectedId.value = null;
    void load();
  }

  void health.load();
  void load();

  return { mails, total, page, selected, isLoading, loadError, isUnavailable, load, select, setPage };
}

/**
 * The web links in an e-mail's text (for following set-password and reset links while developing).
 * Only http(s) addresses are returned, each once.
 * @param text - plain-text body
 */
export function extractLinks(text: string): string[] {
  const found = text.match(/https?:\/\/[^\s<>"')\]]+/g) ?? [];
  return [...new Set(found.map((url) => url.replace(/[.,;:!?]+$/, '')))];
}
