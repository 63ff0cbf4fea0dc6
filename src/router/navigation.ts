import type { Component } from 'vue';
import { Box, EditPen, Message, Stamp, Tickets, User as UserIcon } from '@element-plus/icons-vue';
import type { Role } from '@/api/types';
import { ADMIN_ROLES, DESIGN_ROLES, MEMBER_ROLES, REVIEW_ROLES, SHEET_ROLES, canAccess } from './access';

/** One entry of the main navigation. */
export interface NavItem {
  /** Stable key; the link carries `data-test="nav-<key>"`. */
  key: 'designs' | 'review' | 'sheets' | 'parts' | 'team' | 'outbox';
  label: string;
  to: string;
  icon: Component;
  /** Roles that see it; undefined = every signed-in user. */
  roles?: readonly Role[];
  /** Shown only when the server keeps caught e-mails (development and test). */
  needsOutbox?: boolean;
}

/** The main navigation, in display order. */
export const NAV_ITEMS: readonly NavItem[] = [
  { key: 'designs', label: 'Designs', to: '/designs', icon: EditPen, roles: DESIGN_ROLES },
  { key: 'review', label: 'Review desk', to: '/review', icon: Stamp, roles: REVIEW_ROLES },
  { key: 'sheets', label: 'Sheets', to: '/sheets', icon: Tickets, roles: SHEET_ROLES },
  { key: 'parts', label: 'Parts shelf', to: '/parts', icon: Box, roles: MEMBER_ROLES },
  { key: 'team', label: 'Team', to: '/team', icon: UserIcon, roles: ADMIN_ROLES },
  { key: 'outbox', label: 'Outbox', to: '/outbox', icon: Message, roles: ADMIN_ROLES, needsOutbox: true },
];

/**
 * The navigation items a user sees.
 * @param roles - roles the user holds
 * @param isOutboxEnabled - whether the server reports the Outbox as available
 */
export function visibleNavItems(roles: readonly Role[], isOutboxEnabled: boolean): NavItem[] {
  return NAV_ITEMS.filter((item) => canAccess(item.roles, roles) && (!item.needsOutbox || isOutboxEnabled));
}
