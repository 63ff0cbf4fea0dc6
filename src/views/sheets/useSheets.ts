import { ref, watch } from 'vue';
import { listSheets } from '@/api/sheets';
import { usePagedList } from '@/composables/usePagedList';

/** Rows per page of the Sheets table. */
export const SHEETS_PAGE_SIZE = 20;

/** State of the Sheets screen: approved sheets, newest approval first, optionally without superseded ones. */
export function useSheets() {
  const isCurrentOnly = ref(false);
  const list = usePagedList(
    (page) => listSheets({ page, pageSize: SHEETS_PAGE_SIZE, current: isCurrentOnly.value }),
    'The sheets could not be loaded.',
  );
  // A new filter starts again from the first page (which loads by itself when the page changes).
  watch(isCurrentOnly, () => {
    if (list.page.value !== 1) list.page.value = 1;
    else void list.load();
  });
  return { ...list, isCurrentOnly };
}

/**
 * A byte count in words ("84.9 kB").
 * @param bytes - size in bytes
 */
export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
  return `${(bytes / 1024).toFixed(1)} kB`;
}
