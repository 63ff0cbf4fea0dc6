import { computed, ref, shallowRef, watch } from 'vue';
import { listParts, updatePart, type PartKind, type PartOf } from '@/api/parts';
import { useAuthStore } from '@/stores/auth';
import { confirmAction, errorMessage, showError, showSuccess } from '@/utils/message';
import { SHELVES } from './partFields';

/** Any part of any shelf. */
export type AnyPart = PartOf[PartKind];

/**
 * State and actions of the Parts shelf screen: the chosen shelf, its parts (retired ones on demand), and the
 * admin's add, edit, retire and restore. Everyone else reads.
 */
export function usePartsShelf(initial: PartKind = 'belts') {
  const auth = useAuthStore();
  const kind = ref<PartKind>(initial);
  const showRetired = ref(false);
  const parts = shallowRef<AnyPart[]>([]);
  const isLoading = ref(false);
  const loadError = ref<string | null>(null);
  const busyIds = ref(new Set<number>());
  const isEditOpen = ref(false);
  const editing = shallowRef<AnyPart | null>(null);
  let ticket = 0;

  const isAdmin = computed(() => auth.hasRole('admin'));
  const shelf = computed(() => SHELVES.find((s) => s.kind === kind.value)!);

  async function load(): Promise<void> {
    const mine = ++ticket;
    isLoading.value = true;
    try {
      const items = await listParts(kind.value, showRetired.value);
      if (mine !== ticket) return;
      parts.value = items as AnyPart[];
      loadError.value = null;
    } catch (err) {
      if (mine === ticket) loadError.value = errorMessage(err, 'The shelf could not be loaded.');
    } finally {
      if (mine === ticket) isLoading.value = false;
    }
  }

  watch([kind, showRetired], () => void load(), { immediate: true });

  function openAdd(): void {
    editing.value = null;
    isEditOpen.value = true;
  }

  function openEdit(part: AnyPart): void {
    editing.value = part;
    isEditOpen.value = true;
  }

  async function setRetired(part: AnyPart, retired: boolean): Promise<void> {
    if (retired) {
      const ok = await confirmAction({
        title: `Retire “${part.name}”?`,
        message: 'It stays readable in designs that use it, but is no longer offered on the Design desk. You can restore it later.',
        confirmText: 'Retire',
        isDanger: true,
      });
      if (!ok) return;
    }
    busyIds.value = new Set(busyIds.value).add(part.id);
    try {
      await updatePart(kind.value, part.id, { retired } as never);
      showSuccess(retired ? `Retired “${part.name}”.` : `Restored “${part.name}”.`);
      await load();
    } catch (err) {
      showError(err);
    } finally {
      const next = new Set(busyIds.value);
      next.delete(part.id);
      busyIds.value = next;
    }
  }

  return {
    kind,
    showRetired,
    parts,
    isLoading,
    loadError,
    busyIds,
    isAdmin,
    shelf,
    isEditOpen,
    editing,
    load,
    openAdd,
    openEdit,
    setRetired,
  };
}
