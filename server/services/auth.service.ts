import bcrypt from 'bcryptjs';
import { getConfig } from '../config';
import { getSequelize } from '../db';
import { AppError } from '../errors';
import { logger } from '../logger';
import { User } from '../models';
import { recordAudit } from './audit.service';
import { sendMail } from './mail.service';
import { resetPasswordMail } from './mailTemplates';
import { consumePasswordToken, createPasswordToken } from './passwordToken.service';
import { createSession, revokeAllSessions, type SessionOrigin } from './session.service';
import { toPublicUser, type PublicUser } from './users.service';

/** The one message for every failed sign-in, so the answer never reveals whether an e-mail exists. */
export const INVALID_CREDENTIALS_MESSAGE = 'Wrong e-mail or password.';

/** bcrypt cost: 10 normally; 4 under NODE_ENV=test only to keep the many test users fast. */
function bcryptRounds(): number {
  return getConfig().isTest ? 4 : 10;
}

/** Hashes a password with bcrypt. */
export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, bcryptRounds());
}

let dummyHash: string | undefined;
/** A hash to compare against when the e-mail is unknown, so both failures take the same time. */
async function getDummyHash(): Promise<string> {
  dummyHash ??= await bcrypt.hash('no-such-account-placeholder', bcryptRounds());
  return dummyHash;
}

/** A user just signed in, and the token for their session cookie. */
export type SignedIn = { user: PublicUser; sessionToken: string };

/**
 * Checks e-mail and password and starts a session. Unknown e-mail, wrong password, no password set yet and disabled
 * account all fail with the same 401 `invalid_credentials`.
 */
export async function signIn(email: string, password: string, origin: SessionOrigin = {}): Promise<SignedIn> {
  const user = await login(email, password);
  return { user, sessionToken: await createSession(user.id, origin) };
}

/**
 * Checks e-mail and password. Unknown e-mail, wrong password, no password set yet and disabled account
 * all fail with the same 401 `invalid_credentials`.
 */
export async function login(email: string, password: string): Promise<PublicUser> {
  const user = await User.findOne({ where: { email } });
  const hash = user?.passwordHash ?? (await getDummyHash());
  const matches = await bcrypt.compare(password, hash);
  if (!user || !user.passwordHash || !matches || user.disabled) {
    throw new AppError('invalid_credentials', INVALID_CREDENTIALS_MESSAGE, 401);
  }
  return toPublicUser(user);
}

/**
 * Starts a password reset: when the e-mail belongs to an active account, creates a one-hour token and
 * mails the link. Returns at once either way (the mail goes out in the background) so neither the answer
 * nor its timing reveals whether the account exists.
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const user = await User.findOne({ where: { email } });
  if (!user || user.disabled) return;
  const token = await createPasswordToken(user.id, 'reset');
  const link = `${getConfig().appUrl}/reset?token=${encodeURIComponent(token)}`;
  void sendMail({ to: user.email, ...resetPasswordMail({ name: user.name, link }) }).catch((err: unknown) => {
    logger.error({ err }, 'reset mail failed');
  });
}

/**
 * Sets a new password with a reset or invitation token (one use; expired or used tokens fail with 400), ends every
 * other session of the account (whoever knew the old password is out) and signs this browser in.
 * @returns the user and the token of their new session
 */
export async function resetPassword(rawToken: string, password: string, origin: SessionOrigin = {}): Promise<SignedIn> {
  const passwordHash = await hashPassword(password);
  return getSequelize().transaction(async (transaction) => {
    const user = await consumePasswordToken(rawToken, transaction);
    user.passwordHash = passwordHash;
    await user.save({ transaction });
    const ended = await revokeAllSessions(user.id, 'password_changed', transaction);
    await recordAudit(
      {
        actorId: user.id,
        action: 'user.password_set',
        entity: 'user',
        entityId: user.id,
        reason: ended ? `Ended ${ended} open session(s)` : null,
      },
      transaction,
    );
    const sessionToken = await createSession(user.id, origin, transaction);
    return { user: toPublicUser(user), sessionToken };
  });
}
