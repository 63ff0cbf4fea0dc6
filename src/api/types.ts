import type { Page, Role } from '@/contracts';

export type { Page, Role };

/** Every role, in the order the UI lists them. */
export const ROLES: readonly Role[] = ['designer', 'reviewer', 'maker', 'admin'];

/** A user as the API returns it. */
export interface User {
  id: number;
  email: string;
  name: string;
  roles: Role[];
  disabled: boolean;
  /** Invited and has not set a password yet. */
  isInvited?: boolean;
  /** ISO 8601 timestamp */
  createdAt: string;
}

/** One open session of the signed-in user (GET /api/auth/sessions). */
export interface SessionInfo {
  id: number;
  /** ISO 8601 timestamps: signed in, last request (to within a few minutes), ends. */
  createdAt: string;
  lastSeenAt: string;
  expiresAt: string;
  /** "Firefox on Linux", "curl", "Unknown client". */
  userAgent: string;
  ip: string;
  /** The session of this browser. */
  isCurrent: boolean;
}

/** Paging and search parameters shared by list endpoints. */
export interface PageQuery {
  page?: number;
  pageSize?: number;
  q?: string;
}

/** One validation problem reported by the API: `path` is the field path, e.g. `"roles.0"`. */
export interface ErrorDetail {
  path: string;
  message: string;
}

/** The error body every API failure answers with. */
export interface ErrorBody {
  error: { code: string; message: string; details?: ErrorDetail[] };
}
