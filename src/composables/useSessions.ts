import { ref } from 'vue';
import { useRouter } from 'vue-router';
import * as authApi from '@/api/auth';
import type { SessionInfo } from '@/api/types';
import { useAuthStore } from '@/stores/auth';
import { confirmAction, errorMessage, showError } from '@/utils/message';

/**
 * "Sign out everywhere" (user menu and Active sessions dialog): asks first, ends every session of the user on the
 * server, this one too, and goes to the sign-in page.
 * @returns `signOutEverywhere()`, resolving to whether it went ahead
 */
export function useSignOutEverywhere() {
  const auth = useAuthStore();
  const router = useRouter();

  async function signOutEverywhere(): Promise<boolean> {
    const isConfirmed = await confirmAction({
      title: 'Sign out everywhere?',
      message: 'Every browser and device signed in to your account is signed out, this one too.',
      confirmText: 'Sign out everywhere',
      isDanger: true,
    });
    if (!isConfirmed) return false;
    try {
      await auth.signOutEverywhere();
    } catch (err) {
      showError(err, 'Signing out everywhere failed on the server; you are signed out here.');
    }
    await router.replace({ name: 'sign-in' });
    return true;
  }

  return { signOutEverywhere };
}

/**
 * The signed-in user's open sessions, for the "Active sessions" dialog of the user menu.
 * @returns `sessions`, `isLoading`, `error`, `endingId` (the session being ended), and `load()` / `end(id)`
 */
export function useSessions() {
  const sessions = ref<SessionInfo[]>([]);
  const isLoading = ref(false);
  const error = ref('');
  const endingId = ref<number | null>(null);

  /** Reads the list from the server. */
  async function load(): Promise<void> {
    isLoading.value = true;
    error.value = '';
    try {
      sessions.value = (await authApi.listSessions()).items;
    } catch (err) {
      error.value = errorMessage(err, 'The sessions could not be loaded.');
    } finally {
      isLoading.value = false;
    }
  }

  /**
   * Ends one session (another device: it is signed out at its next request) and drops it from the list.
   * @returns whether it was ended
   */
  async function end(id: number): Promise<boolean> {
    endingId.value = id;
    error.value = '';
    try {
      await authApi.endSession(id);
      sessions.value = sessions.value.filter((s) => s.id !== id);
      return true;
    } catch (err) {
      error.value = errorMessage(err, 'The session could not be ended.');
      return false;
    } finally {
      endingId.value = null;
    }
  }

  return { sessions, isLoading, error, endingId, load, end };
}
