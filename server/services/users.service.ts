import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { Design, User, ROLES, type Role } from '../models';
import { conflict, notFound } from '../errors';
import { getSequelize } from '../db';
import { recordAudit } from './audit.service';
import { createPasswordToken } from './passwordToken.service';
import { sendMail } from './mail.service';
import { inviteMail } from './mailTemplates';
import { getConfig } from '../config';
import type { Page, PublicUser } from '@/contracts';

export type { PublicUser };
import { revokeAllSessions } from './session.service';

/** Keeps only known roles, once each, in the canonical order. */
export function normaliseRoles(roles: unknown): Role[] {
  const list = Array.isArray(roles) ? roles : [];
  return ROLES.filter((r) => list.includes(r));
}

/** The user columns {@link toPublicUser} reads: a model instance, or a row of a plain query (session check). */
export type UserFields = {
  id: number;
  email: string;
  name: string;
  roles: unknown;
  disabled: boolean | number;
  passwordHash: string | null | undefined;
  createdAt: Date | string;
};

/** Converts a user row (model instance or plain query row) to the plain public shape. */
export function toPublicUser(user: UserFields): PublicUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    roles: normaliseRoles(user.roles),
    disabled: Boolean(user.disabled),
    isInvited: user.passwordHash === null || user.passwordHash === undefined,
    createdAt: new Date(user.createdAt).toISOString(),
  };
}

/** Lists users, newest first, optionally filtered by a search over name and e-mail. */
export async function listUsers(query: { page: number; pageSize: number; q?: string }): Promise<Page<PublicUser>> {
  const where: WhereOptions = query.q
    ? { [Op.or]: [{ email: { [Op.like]: `%${escapeLike(query.q)}%` } }, { name: { [Op.like]: `%${escapeLike(query.q)}%` } }] }
    : {};
  const { rows, count } = await User.findAndCountAll({
    where,
    order: [
      ['name', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { items: rows.map(toPublicUser), total: count, page: query.page, pageSize: query.pageSize };
}

/** One user by id, or 404. */
export async function getUserById(id: number): Promise<PublicUser> {
  const user = await User.findByPk(id);
  if (!user) throw notFound('User');
  return toPublicUser(user);
}

/**
 * Active (not disabled) users who hold `role`, for notifications. Admins are not included
 * unless they hold the role themselves.
 * @param transaction - the transaction of the change being announced (never query beside it: issue 12)
 */
export async function findActiveUsersByRole(role: Role, transaction?: Transaction): Promise<PublicUser[]> {
  const sequelize = getSequelize();
  const users = await User.findAll({
    where: { disabled: false, [Op.and]: [sequelize.literal(`JSON_CONTAINS(roles, ${sequelize.escape(JSON.stringify(role))})`)] },
    order: [['id', 'ASC']],
    transaction,
  });
  return users.map(toPublicUser);
}

/**
 * Invites a new user: creates the account without a password and e-mails a set-password link
 * valid for 7 days. @throws 409 when the e-mail is taken.
 */
export async function inviteUser(actor: PublicUser, input: { email: string; name: string; roles: Role[] }): Promise<PublicUser> {
  const sequelize = getSequelize();
  const { user, token } = await sequelize.transaction(async (transaction) => {
    const existing = await User.findOne({ where: { email: input.email }, transaction });
    if (existing) throw conflict(`A user with the e-mail ${input.email} already exists.`, 'email_taken');
    const created = await User.create(
      { email: input.email, name: input.name, roles: normaliseRoles(input.roles), passwordHash: null, disabled: false },
      { transaction },
    );
    const raw = await createPasswordToken(created.id, 'invite', transaction);
    await recordAudit({ actorId: actor.id, action: 'user.invite', entity: 'user', entityId: created.id, toState: 'invited' }, transaction);
    return { user: created, token: raw };
  });
  const link = `${getConfig().appUrl}/reset?token=${encodeURIComponent(token)}&invite=1`;
  await sendMail({ to: user.email, ...inviteMail({ name: user.name, inviterName: actor.name, link }) });
  return toPublicUser(user);
}

/**
 * Changes a user's name, roles or disabled flag. An admin cannot take the admin role from
 * themselves or disable themselves (409), so the team never loses its last way in by accident.
 */
export async function updateUser(
  actor: PublicUser,
  id: number,
  patch: { name?: string; roles?: Role[]; disabled?: boolean },
): Promise<PublicUser> {
  const sequelize = getSequelize();
  return sequelize.transaction(async (transaction: Transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('User');
    const isSelf = user.id === actor.id;
    if (isSelf && patch.roles && !patch.roles.includes('admin')) {
      throw conflict('You cannot remove the admin role from yourself; ask another admin.', 'self_lockout');
    }
    if (isSelf && patch.disabled === true) throw conflict('You cannot disable your own account.', 'self_lockout');

    const before = toPublicUser(user);
    if (patch.name !== undefined) user.name = patch.name;
    if (patch.roles !== undefined) user.roles = normaliseRoles(patch.roles);
    if (patch.disabled !== undefined) user.disabled = patch.disabled;
    await user.save({ transaction });
    const after = toPublicUser(user);
    // The Designs list sorts by the owner's name kept on each design (models/design.model.ts).
    if (before.name !== after.name)
      await Design.update({ ownerName: after.name }, { where: { ownerId: user.id }, transaction, hooks: false });

    if (before.disabled !== after.disabled) {
      // A disabled account is signed out everywhere at once (requests read the session row anyway; this also
      // keeps a later re-enable from reviving the old cookies).
      if (after.disabled) await revokeAllSessions(user.id, 'disabled', transaction);
      await recordAudit(
        {
          actorId: actor.id,
          action: after.disabled ? 'user.disable' : 'user.enable',
          entity: 'user',
          entityId: user.id,
          fromState: before.disabled ? 'disabled' : 'active',
          toState: after.disabled ? 'disabled' : 'active',
        },
        transaction,
      );
    }
    if (before.roles.join(',') !== after.roles.join(',')) {
      await recordAudit(
        {
          actorId: actor.id,
          action: 'user.roles',
          entity: 'user',
          entityId: user.id,
          fromState: before.roles.join(',') || '(none)',
          toState: after.roles.join(',') || '(none)',
        },
        transaction,
      );
    }
    if (before.name !== after.name) {
      await recordAudit({ actorId: actor.id, action: 'user.rename', entity: 'user', entityId: user.id }, transaction);
    }
    return after;
  });
}

/** Escapes % and _ so a search term matches literally inside LIKE. */
function escapeLike(term: string): string {
  return term.replace(/[\\%_]/g, (c) => `\\${c}`);
}
