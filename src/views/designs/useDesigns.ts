import { computed, onMounted, onScopeDispose, ref, shallowRef, watch } from 'vue';
import { storeToRefs } from 'pinia';
import { deleteDesign, designExportUrl, listDesigns, type DesignSortKey, type DesignSummary } from '@/api/designs';
import { useAuthStore } from '@/stores/auth';
import { useDesignsStore } from '@/stores/designs';
import { confirmAction, errorMessage, showError, showSuccess } from '@/utils/message';

/** Delay between the last keystroke in the search box and the request [ms]. */
const SEARCH_DELAY_MS = 300;

/**
 * State and actions of the Designs screen: the server-side paged, sorted, filtered list, and what a person may
 * do with each row (open, rename, copy, export, delete). The server enforces every rule; these only decide
 * which buttons to offer.
 */
export function useDesigns() {
  const auth = useAuthStore();
  const { user } = storeToRefs(auth);
  const store = useDesignsStore();
  const { page, pageSize, sortKey, sortOrder, q, status, mechanism } = storeToRefs(store);

  const rows = shallowRef<DesignSummary[]>([]);
  const total = ref(0);
  const isLoading = ref(false);
  const loadError = ref<string | null>(null);
  const hasLoaded = ref(false);
  let ticket = 0;
  let searchTimer: ReturnType<typeof setTimeout> | null = null;

  const canCreate = computed(() => auth.hasAnyRole(['designer', 'admin']));
  const isMine = (row: DesignSummary): boolean => !!user.value && row.owner?.id === user.value.id;
  /** Owners (designers) rename their drafts and returned work, admins any of those: the server's flag for this user. */
  const canRename = (row: DesignSummary): boolean => row.canEdit;
  /** Drafts and returned work are deleted by their owner, or an admin: the server's flag for this user. */
  const canDelete = (row: DesignSummary): boolean => row.canDelete;

  async function load(): Promise<void> {
    const mine = ++ticket;
    isLoading.value = true;
    try {
      const answer = await listDesigns(store.toQuery());
      if (mine !== ticket) return;
      rows.value = answer.items;
      total.value = answer.total;
      loadError.value = null;
      // A delete can leave the last page empty: step back.
      if (answer.items.length === 0 && answer.total > 0 && page.value > 1) {
        page.value = Math.max(1, Math.ceil(answer.total / pageSize.value));
      }
    } catch (err) {
      if (mine === ticket) loadError.value = errorMessage(err, 'The designs could not be loaded.');
    } finally {
      if (mine === ticket) {
        isLoading.value = false;
        hasLoaded.value = true;
      }
    }
  }

  watch([page, sortKey, sortOrder], () => void load());
  watch(q, () => {
    if (searchTimer) clearTimeout(searchTimer);
    searchTimer = setTimeout(() => {
      if (page.value !== 1)
        page.value = 1; // the page watcher loads
      else void load();
    }, SEARCH_DELAY_MS);
  });
  watch([status, mechanism, pageSize], () => {
    if (page.value !== 1)
      page.value = 1; // the page watcher loads
    else void load();
  });
  onScopeDispose(() => {
    if (searchTimer) clearTimeout(searchTimer);
  });
  onMounted(() => void load());

  /**
   * Applies an Element Plus table sort change; clearing the sort goes back to "last changed first".
   * @param change - column property and order from the table
   */
  function onSortChange(change: { prop: string | null; order: 'ascending' | 'descending' | null }): void {
    const SORTABLE: Record<string, DesignSortKey> = {
      name: 'name',
      updatedAt: 'updatedAt',
      status: 'status',
      mechanism: 'mechanism',
      owner: 'owner',
    };
    const key = change.prop ? SORTABLE[change.prop] : undefined;
    if (!key || !change.order) {
      sortKey.value = 'updatedAt';
      sortOrder.value = 'descending';
    } else {
      sortKey.value = key;
      sortOrder.value = change.order;
    }
    page.value = 1;
  }

  async function remove(row: DesignSummary): Promise<void> {
    const ok = await confirmAction({
      title: 'Delete this draft?',
      message: `“${row.name}” and its inputs will be deleted. This cannot be undone.`,
      confirmText: 'Delete draft',
      isDanger: true,
    });
    if (!ok) return;
    try {
      await deleteDesign(row.id);
      showSuccess(`Deleted “${row.name}”.`);
      await load();
    } catch (err) {
      showError(err);
    }
  }

  function exportUrl(row: DesignSummary): string {
    return designExportUrl(row.id);
  }

  return {
    rows,
    total,
    isLoading,
    loadError,
    hasLoaded,
    page,
    pageSize,
    sortKey,
    sortOrder,
    q,
    status,
    mechanism,
    canCreate,
    isMine,
    canRename,
    canDelete,
    isFiltered: () => store.isFiltered(),
    clearFilters: () => store.clearFilters(),
    load,
    onSortChange,
    remove,
    exportUrl,
  };
}
