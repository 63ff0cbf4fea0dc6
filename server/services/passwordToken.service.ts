import { createHash, randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { PasswordToken, User, type TokenPurpose } from '../models';
import { AppError } from '../errors';

/** How long each kind of link stays valid. */
export const TOKEN_LIFETIME_MS: Record<TokenPurpose, number> = {
  reset: 60 * 60 * 1000, // 1 hour
  invite: 7 * 24 * 60 * 60 * 1000, // 7 days
};

/** SHA-256 hex of a raw token: what the database stores and looks up. */
export function hashToken(raw: string): string {
  return createHash('sha256').update(raw, 'utf8').digest('hex');
}

/**
 * Creates a one-time token for `userId` (32 random bytes, base64url) and stores only its hash.
 * @returns the raw token, to be put into the e-mailed link and then forgotten.
 */
export async function createPasswordToken(userId: number, purpose: TokenPurpose, transaction?: Transaction): Promise<string> {
  const raw = randomBytes(32).toString('base64url');
  await PasswordToken.create(
    { userId, tokenHash: hashToken(raw), purpose, expiresAt: new Date(Date.now() + TOKEN_LIFETIME_MS[purpose]), usedAt: null },
    { transaction },
  );
  return raw;
}

const INVALID = 'This link is invalid, expired or already used. Ask for a new one.';

/**
 * Redeems a raw token inside `transaction`: it must exist, be unused and unexpired, and belong to an
 * active user. Marks it (and every other open token of that user) used, so a link works once.
 * @throws AppError 400 `invalid_token` otherwise — the same message for every reason.
 */
export async function consumePasswordToken(raw: string, transaction: Transaction): Promise<User> {
  const token = await PasswordToken.findOne({
    where: { tokenHash: hashToken(raw) },
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  const now = new Date();
  if (!token || token.usedAt || token.expiresAt.getTime() <= now.getTime()) {
    throw new AppError('invalid_token', INVALID, 400);
  }
  const user = await User.findByPk(token.userId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!user || user.disabled) throw new AppError('invalid_token', INVALID, 400);
  await PasswordToken.update({ usedAt: now }, { where: { userId: user.id, usedAt: { [Op.is]: null } }, transaction });
  return user;
}
