import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory } from 'vue-router';
import { ApiError } from '@/api/http';
import type { Role, User } from '@/api/types';
import * as authApi from '@/api/auth';
import { createAppRouter } from '@/router';

vi.mock('@/api/auth', () => ({
  login: vi.fn(),
  logout: vi.fn(),
  fetchCurrentUser: vi.fn(),
  requestPasswordReset: vi.fn(),
  resetPassword: vi.fn(),
}));

// The guard is under test, not the screens: every lazy view resolves to an empty component.
vi.mock('@/views/auth/SignInView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/auth/ForgotView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/auth/ResetView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/designs/DesignsView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/desk/DesignDeskView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/review/ReviewDeskView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/review/ReviewView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/sheets/SheetsView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/sheets/SheetView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/parts/PartsShelfView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/team/TeamView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/outbox/OutboxView.vue', () => ({ default: { render: () => null } }));
vi.mock('@/views/errors/NotFoundView.vue', () => ({ default: { render: () => null } }));

const api = vi.mocked(authApi);

function signedInAs(roles: Role[]): void {
  const user: User = {
    id: 1,
    email: 'u@example.test',
    name: 'U',
    roles,
    disabled: false,
    isInvited: false,
    createdAt: '2025-01-01T00:00:00Z',
  };
  api.fetchCurrentUser.mockResolvedValue({ user });
}

function signedOut(): void {
  api.fetchCurrentUser.mockRejectedValue(new ApiError(401, 'unauthenticated', 'Sign in first.'));
}

async function visit(path: string) {
  const router = createAppRouter(createMemoryHistory());
  await router.push(path);
  return router.currentRoute.value;
}

describe('router guard', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.resetAllMocks();
    vi.stubGlobal('scrollTo', vi.fn()); // jsdom has no scrolling; the router scrolls to the top on navigation
  });

  it('when signed out and opening a private screen, then goes to sign-in with next', async () => {
    signedOut();
    const route = await visit('/team?page=2');
    expect(route.name).toBe('sign-in');
    expect(route.query.next).toBe('/team?page=2');
  });

  it('when signed out and opening the start page, then goes to sign-in without next', async () => {
    signedOut();
    const route = await visit('/');
    expect(route.name).toBe('sign-in');
    expect(route.query.next).toBeUndefined();
  });

  it.each(['/forgot', '/reset?token=abc&invite=1'])('when signed out and opening %s, then stays there', async (path) => {
    signedOut();
    const route = await visit(path);
    expect(route.fullPath).toBe(path);
  });

  it.each<[Role[], string]>([
    [['maker'], '/sheets'],
    [['reviewer'], '/review'],
  ])('when signed in as %o and opening the start page, then goes to %s', async (roles, expected) => {
    signedInAs(roles);
    const route = await visit('/');
    expect(route.path).toBe(expected);
  });

  it('when signed in and opening sign-in, then goes to the start page instead', async () => {
    signedInAs(['designer']);
    const route = await visit('/sign-in');
    expect(route.path).toBe('/designs');
  });

  it('when signed in without the role, then the URL is kept (the shell shows Not allowed) and the title says so', async () => {
    signedInAs(['maker']);
    const route = await visit('/team');
    expect(route.name).toBe('team');
    expect(document.title).toBe('Not allowed · Gantrywright');
  });

  it('when signed in with the role, then the title names the screen', async () => {
    signedInAs(['admin']);
    await visit('/team');
    expect(document.title).toBe('Team · Gantrywright');
  });

  it('when navigating twice, then asks the server who is signed in only once', async () => {
    signedInAs(['admin']);
    const router = createAppRouter(createMemoryHistory());
    await router.push('/team');
    await router.push('/parts');
    expect(api.fetchCurrentUser).toHaveBeenCalledTimes(1);
  });
});
