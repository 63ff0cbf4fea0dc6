import { computed, onScopeDispose, ref, watch } from 'vue';
import { storeToRefs } from 'pinia';
import { listUsers, updateUser } from '@/api/users';
import type { User } from '@/api/types';
import { useAuthStore } from '@/stores/auth';
import { confirmAction, errorMessage, showError, showSuccess } from '@/utils/message';

/** Rows per page of the Team table. */
export const TEAM_PAGE_SIZE = 20;
/** Delay between the last keystroke in the search box and the request [ms]. */
const SEARCH_DELAY_MS = 300;

/**
 * State and actions of the Team screen (admin): paged, searchable user list; invite and edit
 * dialogs; disabling and enabling with a confirmation. The server refuses what an admin may not do
 * to their own account (409) and its message is shown.
 * @returns list state (`users`, `total`, `page`, `query`, `isLoading`, `loadError`), dialog state and actions
 */
export function useTeam() {
  const { user: me } = storeToRefs(useAuthStore());

  const users = ref<User[]>([]);
  const total = ref(0);
  const page = ref(1);
  const query = ref('');
  const isLoading = ref(false);
  const loadError = ref('');
  /** Ids whose enable/disable call is running. */
  const busyIds = ref<Set<number>>(new Set());

  const isInviteOpen = ref(false);
  const isEditOpen = ref(false);
  const editing = ref<User | null>(null);

  const isEditingSelf = computed(() => editing.value !== null && editing.value.id === me.value?.id);
  const hasMorePages = computed(() => total.value > TEAM_PAGE_SIZE);

  let requestSeq = 0;
  async function load(): Promise<void> {
    const seq = ++requestSeq;
    isLoading.value = true;
    loadError.value = '';
    try {
      const result = await listUsers({ page: page.value, pageSize: TEAM_PAGE_SIZE, q: query.value.trim() || undefined });
      if (seq !== requestSeq) return; // a newer search answered first
      users.value = result.items;
      total.value = result.total;
    } catch (err) {
      if (seq !== requestSeq) return;
      loadError.value = errorMessage(err, 'The team list could not be loaded.');
    } finally {
      if (seq === requestSeq) isLoading.value = false;
    }
  }

  let searchTimer: ReturnType<typeof setTimeout> | undefined;
  watch(query, () => {
    clearTimeout(searchTimer);
    searchTimer = setTimeout(() => {
      page.value = 1;
      void load();
    }, SEARCH_DELAY_MS);
  });
  onScopeDispose(() => clearTimeout(searchTimer));

  function setPage(next: number): void {
    page.value = next;
    void load();
  }

  function isSelf(user: User): boolean {
    return user.id === me.value?.id;
  }

  function replaceRow(updated: User): void {
    users.value = users.value.map((u) => (u.id === updated.id ? updated : u));
  }

  function openInvite(): void {
    isInviteOpen.value = true;
  }

  function onInvited(user: User): void {
    showSuccess(`Invitation sent to ${user.email}.`);
    query.value = '';
    page.value = 1;
    void load();
  }

  function openEdit(user: User): void {
    editing.value = user;
    isEditOpen.value = true;
  }

  function onSaved(user: User): void {
    replaceRow(user);
    showSuccess(`Saved changes to ${user.name}.`);
  }

  async function toggleDisabled(user: User): Promise<void> {
    const isDisabling = !user.disabled;
    const confirmed = await confirmAction(
      isDisabling
        ? {
            title: `Disable ${user.name}?`,
            message: `${user.email} will be signed out and cannot sign in until enabled again. Their designs and history stay.`,
            confirmText: 'Disable',
            isDanger: true,
          }
        : {
            title: `Enable ${user.name}?`,
            message: `${user.email} will be able to sign in again with their roles.`,
            confirmText: 'Enable',
          },
    );
    if (!confirmed) return;
    busyIds.value = new Set(busyIds.value).add(user.id);
    try {
      const { user: updated } = await updateUser(user.id, { disabled: isDisabling });
      replaceRow(updated);
      showSuccess(isDisabling ? `${updated.name} is disabled.` : `${updated.name} can sign in again.`);
    } catch (err) {
      showError(err);
    } finally {
      const next = new Set(busyIds.value);
      next.delete(user.id);
      busyIds.value = next;
    }
  }

  void load();

  return {
    users,
    total,
    page,
    query,
    isLoading,
    loadError,
    busyIds,
    hasMorePages,
    isInviteOpen,
    isEditOpen,
    editing,
    isEditingSelf,
    load,
    setPage,
    isSelf,
    openInvite,
    onInvited,
    openEdit,
    onSaved,
    toggleDisabled,
  };
}
