import { Router } from 'express';
import { validate } from '../middleware/validate';
import { requireAuth } from '../middleware/requireAuth';
import { loginRateLimitMiddleware } from '../middleware/rateLimit';
import { forgotSchema, loginSchema, resetSchema, type LoginInput, type ResetInput } from '../schemas/auth.schema';
import { login, requestPasswordReset, resetPassword } from '../services/auth.service';
import { createSessionToken, SESSION_COOKIE, sessionCookieOptions } from '../services/session.service';

/** /api/auth: sign-in, sign-out, current user, forgotten password, reset/invitation links. */
export function createAuthRouter(): Router {
  const router = Router();

  router.post('/login', validate({ body: loginSchema }), loginRateLimitMiddleware(), async function signIn(req, res) {
    const { email, password } = req.body as LoginInput;
    const user = await login(email, password);
    res.cookie(SESSION_COOKIE, createSessionToken(user.id), sessionCookieOptions());
    res.status(200).json({ user });
  });

  router.post('/logout', function signOut(_req, res) {
    res.clearCookie(SESSION_COOKIE, sessionCookieOptions(true));
    res.status(204).end();
  });

  router.get('/me', requireAuth, function me(req, res) {
    res.status(200).json({ user: req.user });
  });

  router.post('/forgot', validate({ body: forgotSchema }), async function forgot(req, res) {
    await requestPasswordReset((req.body as { email: string }).email);
    res.status(202).json({ message: 'If the address belongs to an account, a reset link is on its way.' });
  });

  router.post('/reset', validate({ body: resetSchema }), async function reset(req, res) {
    const { token, password } = req.body as ResetInput;
    const user = await resetPassword(token, password);
    res.cookie(SESSION_COOKIE, createSessionToken(user.id), sessionCookieOptions());
    res.status(200).json({ user });
  });

  return router;
}
