import type { ErrorBody, ErrorDetail, Page, PublicUser, Role, SessionItem } from '@/contracts';

// The response shapes are declared once, in src/contracts; the client's older names stay as aliases.
export type { ErrorBody, ErrorDetail, Page, Role };
/** A user as the API returns it. */
export type User = PublicUser;
/** One open session of the signed-in user (GET /api/auth/sessions). */
export type SessionInfo = SessionItem;

/** Every role, in the order the UI lists them. */
export const ROLES: readonly Role[] = ['designer', 'reviewer', 'maker', 'admin'];

/** Paging and search parameters shared by list endpoints. */
export interface PageQuery {
  page?: number;
  pageSize?: number;
  q?: string;
}
