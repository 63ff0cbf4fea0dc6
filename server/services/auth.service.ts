import { getConfig } from '../config';
import { getSequelize } from '../db';
import { AppError, validationError } from '../errors';
import { personalPasswordProblems } from '../security/passwordPolicy';
import { User } from '../models';
import { recordAudit } from './audit.service';
import { deliverSoon, queueMail } from './notify.service';
import { consumePasswordToken } from './passwordToken.service';
import { RESET_MAIL_KIND, RESET_MAIL_SUBJECT } from './resetMail';
import { createSession, revokeAllSessions, type SessionOrigin } from './session.service';
import { toPublicUser, type PublicUser } from './users.service';
import { compareInPool, hashInPool } from '../workers/passwordPool';

/** The one message for every failed sign-in, so the answer never reveals whether an e-mail exists. */
export const INVALID_CREDENTIALS_MESSAGE = 'Wrong e-mail or password.';

/** bcrypt cost: 10 normally; 4 under NODE_ENV=test only to keep the many test users fast. */
function bcryptRounds(): number {
  return getConfig().isTest ? 4 : 10;
}

/** bcrypt reads at most this many bytes of a password; the policy refuses longer ones when they are set. */
export const BCRYPT_MAX_BYTES = 72;

/** Hashes a password with bcrypt, in the password worker pool (never on the event loop). */
export async function hashPassword(password: string): Promise<string> {
  return hashInPool(password, bcryptRounds());
}

let dummyHash: Promise<string> | undefined;
/** A hash to compare against when the e-mail is unknown, so both failures take the same time. */
function getDummyHash(): Promise<string> {
  dummyHash ??= hashInPool('no-such-account-placeholder', bcryptRounds());
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
  const matches = await compareInPool(password, hash);
  // bcrypt ignores bytes past the 72nd: a longer password must not sign in as its first 72 bytes.
  const isTooLong = Buffer.byteLength(password, 'utf8') > BCRYPT_MAX_BYTES;
  if (!user || !user.passwordHash || !matches || isTooLong || user.disabled) {
    throw new AppError('invalid_credentials', INVALID_CREDENTIALS_MESSAGE, 401);
  }
  return toPublicUser(user);
}

/**
 * Starts a password reset: queues a reset request for the address and returns. The same single insert happens for
 * every address, known or not, so neither the answer nor its timing tells whether an account exists; the mail
 * queue then looks the address up, creates the one-hour token and sends the link — or discards the request when no
 * active account has that address (see resetMail.ts).
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const ids = await queueMail(RESET_MAIL_KIND, [{ email, name: '' }], () => ({ subject: RESET_MAIL_SUBJECT, text: '', html: '' }));
  deliverSoon(ids);
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
    // Throwing here rolls the transaction back: the link stays unused and can be tried again.
    const personal = personalPasswordProblems(password, user);
    if (personal.length)
      throw validationError(
        personal.map((message) => ({ path: 'password', message })),
        'Choose another password.',
      );
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
