import type { ErrorBody, ErrorDetail, Page, PublicUser, Role, SessionItem } from '@/contracts';

// The response shapes are declared once, in src/contracts; the client's older names stay as aliases.
export type { ErrorBody, ErrorDetail, Page, Role };
/** A user as the API returns it. */
export type User = PublicUser;
/** One open session of the signed-in user (GET /api/auth/sessions). */
export type SessionInfo = SessionItem;
