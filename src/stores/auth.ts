import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import * as authApi from '@/api/auth';
import { isApiError } from '@/api/http';
import type { Role, User } from '@/api/types';

/**
 * The signed-in user and the session actions.
 *
 * `fetchMe()` asks the server once per page load (the router guard awaits it before the first
 * navigation); later calls reuse that answer unless `force` is set. The session itself lives in an
 * httpOnly cookie the page cannot read, so the server's answer is the only truth.
 */
export const useAuthStore = defineStore('auth', () => {
  /** The signed-in user, or null. */
  const user = ref<User | null>(null);
  /** true once the server has been asked who is signed in. */
  const isLoaded = ref(false);
  let pending: Promise<User | null> | null = null;

  /** true when someone is signed in. */
  const isSignedIn = computed(() => user.value !== null);
  /** Roles of the signed-in user (empty when signed out). */
  const roles = computed<Role[]>(() => user.value?.roles ?? []);

  /**
   * Whether the signed-in user holds a role.
   * @param role - the role to check
   */
  function hasRole(role: Role): boolean {
    return roles.value.includes(role);
  }

  /**
   * Whether the signed-in user holds at least one of the roles.
   * @param wanted - roles that grant access
   */
  function hasAnyRole(wanted: readonly Role[]): boolean {
    return wanted.some((r) => roles.value.includes(r));
  }

  /**
   * Asks the server who is signed in. A 401 means nobody (not an error); other failures are
   * rethrown after marking the store loaded, so the app can still show the sign-in page.
   * @param options.force - ask again even if already loaded
   * @returns the user or null
   */
  async function fetchMe(options: { force?: boolean } = {}): Promise<User | null> {
    if (isLoaded.value && !options.force) return user.value;
    if (pending && !options.force) return pending;
    pending = (async () => {
      try {
        const { user: me } = await authApi.fetchCurrentUser();
        user.value = me;
        return me;
      } catch (err) {
        user.value = null;
        if (isApiError(err) && err.status === 401) return null;
        throw err;
      } finally {
        isLoaded.value = true;
        pending = null;
      }
    })();
    return pending;
  }

  /**
   * Signs in; the API's error (wrong e-mail or password, rate limited, …) is rethrown as ApiError.
   * @returns the signed-in user
   */
  async function signIn(email: string, password: string): Promise<User> {
    const { user: me } = await authApi.login(email.trim(), password);
    user.value = me;
    isLoaded.value = true;
    return me;
  }

  /** Signs out on the server and forgets the user here, even if the server call fails. */
  async function signOut(): Promise<void> {
    try {
      await authApi.logout();
    } finally {
      clear();
    }
  }

  /** Ends every session of the user on the server ("sign out everywhere"), then forgets the user here, even if the call fails. */
  async function signOutEverywhere(): Promise<void> {
    try {
      await authApi.signOutEverywhere();
    } finally {
      clear();
    }
  }

  /**
   * Takes a user the server returned from another call that signs in (password reset, invitation).
   * @param me - the user now signed in
   */
  function setUser(me: User): void {
    user.value = me;
    isLoaded.value = true;
  }

  /** Forgets the user locally (the session expired or was ended elsewhere). */
  function clear(): void {
    user.value = null;
    isLoaded.value = true;
  }

  return { user, isLoaded, isSignedIn, roles, hasRole, hasAnyRole, fetchMe, signIn, signOut, signOutEverywhere, setUser, clear };
});
