import { describe, expect, it } from 'vitest';
import type { Role } from '@/api/types';
import { canAccess, homePathFor, safeNextPath, ADMIN_ROLES, DESIGN_ROLES } from '@/router/access';
import { NAV_ITEMS, visibleNavItems } from '@/router/navigation';
import { routes } from '@/router';

describe('canAccess', () => {
  it.each<[readonly Role[] | undefined, Role[], boolean]>([
    [undefined, [], true],
    [[], ['maker'], true],
    [ADMIN_ROLES, ['admin'], true],
    [ADMIN_ROLES, ['designer', 'reviewer', 'maker'], false],
    [DESIGN_ROLES, ['reviewer'], true],
    [DESIGN_ROLES, ['maker'], false],
  ])('when a screen allows %o and the user holds %o, then answers %s', (allowed, roles, expected) => {
    expect(canAccess(allowed, roles)).toBe(expected);
  });
});

describe('homePathFor', () => {
  it.each<[Role[], string]>([
    [['admin'], '/designs'],
    [['designer'], '/designs'],
    [['reviewer'], '/review'], // fix: #13 reviewers land on the Review desk
    [['maker'], '/sheets'],
    [[], '/account'],
  ])('when the user holds %o, then starts at %s', (roles, expected) => {
    expect(homePathFor(roles)).toBe(expected);
  });
});

describe('safeNextPath', () => {
  it.each<[unknown, string | null]>([
    ['/team', '/team'],
    ['/designs/4?tab=checks', '/designs/4?tab=checks'],
    ['https://elsewhere.example/', null],
    ['//elsewhere.example/', null],
    ['/\\elsewhere.example', null],
    ['/sign-in?next=/team', null],
    [['/team'], null],
    [undefined, null],
  ])('when next is %o, then uses %o', (next, expected) => {
    expect(safeNextPath(next)).toBe(expected);
  });
});

describe('navigation and routes', () => {
  it('when listing the navigation, then every item points at a route with the same role limits', () => {
    for (const item of NAV_ITEMS) {
      const route = routes.find((r) => r.path === item.to);
      expect(route, item.to).toBeDefined();
      expect(route!.meta?.roles).toEqual(item.roles);
    }
  });

  it('when the outbox is off, then even an admin does not see it', () => {
    expect(visibleNavItems(['admin'], false).map((i) => i.key)).not.toContain('outbox');
    expect(visibleNavItems(['admin'], true).map((i) => i.key)).toContain('outbox');
  });
});
