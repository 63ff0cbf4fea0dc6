import { ref, shallowRef, watch, type Ref, type ShallowRef } from 'vue';
import { deleteAttachment, listAttachments, uploadAttachment, type AttachmentPage } from '@/api/attachments';
import { isApiError } from '@/api/http';
import { errorMessage } from '@/utils/message';

/** State and actions of a design's attachments panel. */
export interface UseDesignAttachments {
  page: ShallowRef<AttachmentPage | null>;
  isLoading: Ref<boolean>;
  isUploading: Ref<boolean>;
  /** The API's message for the last failed action. */
  error: Ref<string>;
  busyIds: Ref<Set<number>>;
  load: () => Promise<void>;
  add: (file: File) => Promise<boolean>;
  remove: (id: number) => Promise<boolean>;
}

/**
 * Lists, uploads and deletes the files attached to a design.
 * @param designId - the design (reactive)
 */
export function useDesignAttachments(designId: Ref<number>): UseDesignAttachments {
  const page = shallowRef<AttachmentPage | null>(null);
  const isLoading = ref(false);
  const isUploading = ref(false);
  const error = ref('');
  const busyIds = ref(new Set<number>());

  async function load(): Promise<void> {
    isLoading.value = true;
    try {
      page.value = await listAttachments(designId.value);
    } catch (err) {
      error.value = errorMessage(err, 'The attachments could not be loaded.');
    } finally {
      isLoading.value = false;
    }
  }

  async function add(file: File): Promise<boolean> {
    isUploading.value = true;
    error.value = '';
    try {
      await uploadAttachment(designId.value, file);
      await load();
      return true;
    } catch (err) {
      error.value = isApiError(err) ? err.message : errorMessage(err);
      return false;
    } finally {
      isUploading.value = false;
    }
  }

  async function remove(id: number): Promise<boolean> {
    busyIds.value = new Set([...busyIds.value, id]);
    error.value = '';
    try {
      await deleteAttachment(id);
      await load();
      return true;
    } catch (err) {
      error.value = errorMessage(err);
      return false;
    } finally {
      const next = new Set(busyIds.value);
      next.delete(id);
      busyIds.value = next;
    }
  }

  watch(designId, () => void load(), { immediate: true });
  return { page, isLoading, isUploading, error, busyIds, load, add, remove };
}
