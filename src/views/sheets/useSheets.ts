import { onMounted, ref, shallowRef, watch } from 'vue';
import { listSheets, type SheetListItem } from '@/api/sheets';
import { errorMessage } from '@/utils/message';

/** Rows per page of the Sheets table. */
export const SHEETS_PAGE_SIZE = 20;

/** State of the Sheets screen: approved sheets, newest approval first, optionally without superseded ones. */
export function useSheets() {
  const rows = shallowRef<SheetListItem[]>([]);
  const total = ref(0);
  const page = ref(1);
  const isCurrentOnly = ref(false);
  const isLoading = ref(false);
  const hasLoaded = ref(false);
  const loadError = ref<string | null>(null);
  let ticket = 0;

  /** (Re)loads the current page. */
  async function load(): Promise<void> {
    const mine = ++ticket;
    isLoading.value = true;
    try {
      const answer = await listSheets({ page: page.value, pageSize: SHEETS_PAGE_SIZE, current: isCurrentOnly.value });
      if (mine !== ticket) return;
      rows.value = answer.items;
      total.value = answer.total;
      loadError.value = null;
    } catch (err) {
      if (mine === ticket) loadError.value = errorMessage(err, 'The sheets could not be loaded.');
    } finally {
      if (mine === ticket) {
        isLoading.value = false;
        hasLoaded.value = true;
      }
    }
  }

  watch(page, () => void load());
  watch(isCurrentOnly, () => {
    if (page.value !== 1) page.value = 1;
    else void load();
  });
  onMounted(() => void load());

  return { rows, total, page, isCurrentOnly, isLoading, hasLoaded, loadError, load };
}

/**
 * A byte count in words ("84.9 kB").
 * @param bytes - size in bytes
 */
export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
  return `${(bytes / 1024).toFixed(1)} kB`;
}
