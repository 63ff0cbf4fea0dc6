import type { PublicUser } from './services/users.service';

declare global {
  namespace Express {
    interface Request {
      /** Request id (X-Request-Id), set by requestIdMiddleware. */
      id: string;
      /** The signed-in user, set by requireAuth. */
      user?: PublicUser;
      /** The id of the signed-in user's session (row of `sessions`), set with `user`. */
      sessionId?: number;
    }
  }
}

export {};
