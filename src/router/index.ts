import { createRouter, createWebHistory, type RouteRecordRaw, type Router, type RouterHistory } from 'vue-router';
import type { Role } from '@/api/types';
import { useAuthStore } from '@/stores/auth';
import { ADMIN_ROLES, DESIGN_ROLES, MEMBER_ROLES, REVIEW_ROLES, SHEET_ROLES, canAccess, homePathFor, safeNextPath } from './access';

declare module 'vue-router' {
  interface RouteMeta {
    /** Page title (the browser tab reads "<title> · Gantrywright"). */
    title?: string;
    /** Navigation section shown in the header, when it differs from the title. */
    section?: string;
    /** Roles that may open the screen; absent = every signed-in user. */
    roles?: readonly Role[];
    /** Reachable without signing in (sign-in, forgot, reset). */
    public?: true;
    /** Only for people who are signed out; signed-in users go to their start page. */
    guestOnly?: true;
    /** Id of the element holding the screen's results, for the "Skip to the results" link. */
    resultsAnchor?: string;
  }
}

const APP_NAME = 'Gantrywright';

/** Every screen of the app. Views load lazily, one chunk each. */
export const routes: RouteRecordRaw[] = [
  // The start page depends on the user's roles, so the guard below decides where `/` goes.
  { path: '/', name: 'home', component: { render: () => null }, meta: { title: 'Start' } },
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/auth/SignInView.vue'),
    meta: { title: 'Sign in', public: true, guestOnly: true },
  },
  {
    path: '/forgot',
    name: 'forgot',
    component: () => import('@/views/auth/ForgotView.vue'),
    meta: { title: 'Forgot password', public: true, guestOnly: true },
  },
  {
    path: '/reset',
    name: 'reset',
    component: () => import('@/views/auth/ResetView.vue'),
    meta: { title: 'Set a new password', public: true },
  },
  {
    path: '/designs',
    name: 'designs',
    component: () => import('@/views/designs/DesignsView.vue'),
    meta: { title: 'Designs', roles: DESIGN_ROLES },
  },
  {
    path: '/designs/:id',
    name: 'design-desk',
    component: () => import('@/views/desk/DesignDeskView.vue'),
    meta: { title: 'Design desk', section: 'Designs', roles: DESIGN_ROLES, resultsAnchor: 'wb-results' },
  },
  {
    path: '/review',
    name: 'review-desk',
    component: () => import('@/views/review/ReviewDeskView.vue'),
    meta: { title: 'Review desk', roles: REVIEW_ROLES },
  },
  {
    path: '/review/:revisionId',
    name: 'review',
    component: () => import('@/views/review/ReviewView.vue'),
    meta: { title: 'Review', section: 'Review desk', roles: DESIGN_ROLES, resultsAnchor: 'rv-results' },
  },
  {
    path: '/sheets',
    name: 'sheets',
    component: () => import('@/views/sheets/SheetsView.vue'),
    meta: { title: 'Sheets', roles: SHEET_ROLES },
  },
  {
    path: '/sheets/:id',
    name: 'sheet',
    component: () => import('@/views/sheets/SheetView.vue'),
    meta: { title: 'Design sheet', section: 'Sheets', roles: SHEET_ROLES },
  },
  {
    path: '/parts',
    name: 'parts',
    component: () => import('@/views/parts/PartsShelfView.vue'),
    meta: { title: 'Parts shelf', roles: MEMBER_ROLES },
  },
  { path: '/account', name: 'account', component: () => import('@/views/account/AccountView.vue'), meta: { title: 'Your account' } },
  { path: '/team', name: 'team', component: () => import('@/views/team/TeamView.vue'), meta: { title: 'Team', roles: ADMIN_ROLES } },
  {
    path: '/outbox',
    name: 'outbox',
    component: () => import('@/views/outbox/OutboxView.vue'),
    meta: { title: 'Outbox', roles: ADMIN_ROLES },
  },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/errors/NotFoundView.vue'), meta: { title: 'Not found' } },
];

/**
 * Creates the router with the auth guard.
 *
 * - Before the first navigation the guard asks the server who is signed in (once; the store keeps it).
 * - Signed-out visitors of a private screen go to `/sign-in?next=<where they were going>`.
 * - A signed-in user lacking a screen's role still reaches the URL; the app shell shows a
 *   "Not allowed" page in place of the screen (the server refuses the data in any case).
 * @param history - browser history (tests pass a memory history)
 */
export function createAppRouter(history: RouterHistory = createWebHistory()): Router {
  const router = createRouter({
    history,
    routes,
    scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
  });

  router.beforeEach(async (to) => {
    const auth = useAuthStore();
    try {
      await auth.fetchMe();
    } catch {
      // Server unreachable: treat as signed out; the sign-in page reports the problem on submit.
    }
    if (to.meta.public) {
      if (to.meta.guestOnly && auth.isSignedIn) return safeNextPath(to.query.next) ?? homePathFor(auth.roles);
      return true;
    }
    if (!auth.isSignedIn) {
      return to.name === 'home' ? { name: 'sign-in' } : { name: 'sign-in', query: { next: to.fullPath } };
    }
    if (to.name === 'home') return homePathFor(auth.roles);
    return true;
  });

  router.afterEach((to) => {
    if (typeof document === 'undefined') return;
    const auth = useAuthStore();
    const isRefused = !to.meta.public && auth.isSignedIn && !canAccess(to.meta.roles, auth.roles);
    const title = isRefused ? 'Not allowed' : to.meta.title;
    document.title = title ? `${title} · ${APP_NAME}` : APP_NAME;
  });

  return router;
}
