import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { ApiError } from '@/api/http';
import type { User } from '@/api/types';
import * as authApi from '@/api/auth';
import { useAuthStore } from '@/stores/auth';

vi.mock('@/api/auth', () => ({
  login: vi.fn(),
  logout: vi.fn(),
  fetchCurrentUser: vi.fn(),
  requestPasswordReset: vi.fn(),
  resetPassword: vi.fn(),
}));

const api = vi.mocked(authApi);

const DESIGNER: User = {
  id: 2,
  email: 'designer@example.test',
  name: 'Dana Draftsman',
  roles: ['designer'],
  disabled: false,
  isInvited: false,
  createdAt: '2025-01-01T00:00:00.000Z',
};

describe('useAuthStore', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.resetAllMocks();
  });

  it('when created, then nobody is signed in and no role is held', () => {
    const auth = useAuthStore();
    expect(auth.isSignedIn).toBe(false);
    expect(auth.roles).toEqual([]);
    expect(auth.hasRole('admin')).toBe(false);
  });

  it('when signing in succeeds, then keeps the user and answers role questions', async () => {
    // Arrange
    api.login.mockResolvedValue({ user: DESIGNER });
    const auth = useAuthStore();
    // Act
    const user = await auth.signIn('  designer@example.test ', 'gantry-demo');
    // Assert
    expect(user).toEqual(DESIGNER);
    expect(api.login).toHaveBeenCalledWith('designer@example.test', 'gantry-demo');
    expect(auth.isSignedIn).toBe(true);
    expect(auth.hasRole('designer')).toBe(true);
    expect(auth.hasRole('admin')).toBe(false);
    expect(auth.hasAnyRole(['reviewer', 'designer'])).toBe(true);
    expect(auth.hasAnyRole(['reviewer', 'maker'])).toBe(false);
  });

  it('when signing in fails, then rethrows the API error and stays signed out', async () => {
    api.login.mockRejectedValue(new ApiError(401, 'invalid_credentials', 'Wrong e-mail or password.'));
    const auth = useAuthStore();
    await expect(auth.signIn('designer@example.test', 'nope')).rejects.toMatchObject({ status: 401, message: 'Wrong e-mail or password.' });
    expect(auth.isSignedIn).toBe(false);
  });

  it('when fetchMe is called twice, then asks the server only once', async () => {
    api.fetchCurrentUser.mockResolvedValue({ user: DESIGNER });
    const auth = useAuthStore();
    const [a, b] = await Promise.all([auth.fetchMe(), auth.fetchMe()]);
    await auth.fetchMe();
    expect(a).toEqual(DESIGNER);
    expect(b).toEqual(DESIGNER);
    expect(api.fetchCurrentUser).toHaveBeenCalledTimes(1);
    expect(auth.isLoaded).toBe(true);
  });

  it('when fetchMe is forced, then asks the server again', async () => {
    api.fetchCurrentUser
      .mockResolvedValueOnce({ user: DESIGNER })
      .mockResolvedValueOnce({ user: { ...DESIGNER, roles: ['designer', 'reviewer'] } });
    const auth = useAuthStore();
    await auth.fetchMe();
    await auth.fetchMe({ force: true });
    expect(api.fetchCurrentUser).toHaveBeenCalledTimes(2);
    expect(auth.hasRole('reviewer')).toBe(true);
  });

  it('when the server answers 401 to fetchMe, then resolves to null without throwing', async () => {
    api.fetchCurrentUser.mockRejectedValue(new ApiError(401, 'unauthenticated', 'Sign in first.'));
    const auth = useAuthStore();
    await expect(auth.fetchMe()).resolves.toBeNull();
    expect(auth.isSignedIn).toBe(false);
    expect(auth.isLoaded).toBe(true);
  });

  it('when the server cannot be reached during fetchMe, then rethrows and still marks the store loaded', async () => {
    api.fetchCurrentUser.mockRejectedValue(new ApiError(0, 'network_error', 'Cannot reach the server.'));
    const auth = useAuthStore();
    await expect(auth.fetchMe()).rejects.toMatchObject({ code: 'network_error' });
    expect(auth.isLoaded).toBe(true);
    expect(auth.user).toBeNull();
  });

  it('when signing out, then forgets the user even if the server call fails', async () => {
    api.login.mockResolvedValue({ user: DESIGNER });
    api.logout.mockRejectedValue(new ApiError(0, 'network_error', 'Cannot reach the server.'));
    const auth = useAuthStore();
    await auth.signIn('designer@example.test', 'gantry-demo');
    await expect(auth.signOut()).rejects.toBeInstanceOf(ApiError);
    expect(auth.isSignedIn).toBe(false);
  });

  it('when a reset signs someone in, then setUser takes that user', () => {
    const auth = useAuthStore();
    auth.setUser({ ...DESIGNER, roles: ['maker'] });
    expect(auth.isSignedIn).toBe(true);
    expect(auth.hasRole('maker')).toBe(true);
  });
});
