import { Router, type Request } from 'express';
import { validate } from '../middleware/validate';
import { requireAuth, sessionToken } from '../middleware/requireAuth';
import { loginIpRateLimitMiddleware, loginRateLimitMiddleware, resetRateLimitMiddleware } from '../middleware/rateLimit';
import { idParamsSchema } from '../schemas/common.schema';
import { forgotSchema, loginSchema, resetSchema, type LoginInput, type ResetInput } from '../schemas/auth.schema';
import { requestPasswordReset, resetPassword, signIn } from '../services/auth.service';
import { endOwnSession, listSessions, SESSION_COOKIE, sessionCookieOptions, signOut, signOutEverywhere } from '../services/session.service';

/** Where a sign-in comes from, for the sessions list. */
const originOf = (req: Request) => ({ userAgent: req.get('user-agent'), ip: req.ip });
const context = (req: Request) => ({ user: req.user!, sessionId: req.sessionId! });

/**
 * /api/auth: sign-in, sign-out, current user, the user's sessions, forgotten password, reset/invitation links.
 *   POST   /login              {email, password} → sets the session cookie
 *   POST   /logout             ends this session (if any) and clears the cookie → 204
 *   GET    /me                 the signed-in user (any account, also one without a role)
 *   GET    /sessions           the signed-in user's open sessions → { items, total, page, pageSize }
 *   DELETE /sessions/:id       ends one of them → 204
 *   DELETE /sessions           "sign out everywhere": ends all of them, this one too → 204
 *   POST   /forgot {email} · POST /reset {token, password}
 */
export function createAuthRouter(): Router {
  const router = Router();

  router.post(
    '/login',
    validate({ body: loginSchema }),
    loginIpRateLimitMiddleware(),
    loginRateLimitMiddleware(),
    async function signInHandler(req, res) {
      const { email, password } = req.body as LoginInput;
      const { user, sessionToken: token } = await signIn(email, password, originOf(req));
      res.cookie(SESSION_COOKIE, token, sessionCookieOptions());
      res.status(200).json({ user });
    },
  );

  router.post('/logout', async function signOutHandler(req, res) {
    await signOut(sessionToken(req));
    res.clearCookie(SESSION_COOKIE, sessionCookieOptions(true));
    res.status(204).end();
  });

  router.get('/me', requireAuth, function me(req, res) {
    res.status(200).json({ user: req.user });
  });

  router.get('/sessions', requireAuth, async function list(req, res) {
    res.status(200).json(await listSessions(context(req)));
  });

  router.delete('/sessions/:id', requireAuth, validate({ params: idParamsSchema }), async function remove(req, res) {
    const { wasCurrent } = await endOwnSession(context(req), (req.params as unknown as { id: number }).id);
    if (wasCurrent) res.clearCookie(SESSION_COOKIE, sessionCookieOptions(true));
    res.status(204).end();
  });

  router.delete('/sessions', requireAuth, async function removeAll(req, res) {
    await signOutEverywhere(context(req));
    res.clearCookie(SESSION_COOKIE, sessionCookieOptions(true));
    res.status(204).end();
  });

  router.post('/forgot', validate({ body: forgotSchema }), ...resetRateLimitMiddleware(), async function forgot(req, res) {
    await requestPasswordReset((req.body as { email: string }).email);
    res.status(202).json({ message: 'If the address belongs to an account, a reset link is on its way.' });
  });

  router.post('/reset', validate({ body: resetSchema }), async function reset(req, res) {
    const { token, password } = req.body as ResetInput;
    const { user, sessionToken: newToken } = await resetPassword(token, password, originOf(req));
    res.cookie(SESSION_COOKIE, newToken, sessionCookieOptions());
    res.status(200).json({ user });
  });

  return router;
}
