import type { Role } from './enums';

/** A user as the API shows it: never the password hash. */
export type PublicUser = {
  id: number;
  email: string;
  name: string;
  roles: Role[];
  disabled: boolean;
  /** Invited and has not set a password yet: cannot sign in until they follow the invitation. */
  isInvited: boolean;
  /** ISO 8601 timestamp */
  createdAt: string;
};

/** One open session of the signed-in user (GET /api/auth/sessions). */
export type SessionItem = {
  id: number;
  /** ISO 8601 timestamps: signed in, last request (to within a few minutes), ends. */
  createdAt: string;
  lastSeenAt: string;
  expiresAt: string;
  /** "Firefox on Linux", "curl", "Unknown client". */
  userAgent: string;
  ip: string;
  /** The session of the request that asked (this browser). */
  isCurrent: boolean;
};
