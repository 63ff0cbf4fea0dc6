import { ref, shallowRef, watch, type Ref } from 'vue';
import { getSheet, type SheetDetail } from '@/api/sheets';
import { isApiError } from '@/api/http';
import { errorMessage } from '@/utils/message';

/**
 * State of the sheet page: one approved sheet with its files, hashes and the build figures of its revision.
 * @param id - the sheet id from the route
 */
export function useSheet(id: Ref<number>) {
  const sheet = shallowRef<SheetDetail | null>(null);
  const isLoading = ref(true);
  const loadError = ref<string | null>(null);
  const notFound = ref(false);

  /** (Re)loads the sheet. */
  async function load(): Promise<void> {
    isLoading.value = true;
    loadError.value = null;
    notFound.value = false;
    try {
      sheet.value = await getSheet(id.value);
    } catch (err) {
      sheet.value = null;
      if (isApiError(err) && (err.status === 404 || err.status === 400)) notFound.value = true;
      loadError.value = errorMessage(err, 'The sheet could not be loaded.');
    } finally {
      isLoading.value = false;
    }
  }

  watch(id, () => void load(), { immediate: true });

  return { sheet, isLoading, loadError, notFound, load };
}
