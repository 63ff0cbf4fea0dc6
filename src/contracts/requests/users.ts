// What an admin sends to /api/users (the team), /api/audit and /api/outbox.
import { z } from 'zod';
import { ROLES } from '../enums';
import { emailSchema, paginationSchema } from './common';

const nameSchema = z.string({ message: 'is required' }).trim().min(1, 'is required').max(120, 'must be at most 120 characters');

const rolesSchema = z
  .array(z.enum(ROLES, { message: `must be one of ${ROLES.join(', ')}` }), { message: 'must be a list of roles' })
  .refine((roles) => new Set(roles).size === roles.length, 'must not repeat a role');

/** GET /api/users?page&pageSize&q */
export const listUsersQuerySchema = paginationSchema.extend({
  q: z.string({ message: 'must be a single search term' }).trim().max(100, 'must be at most 100 characters').optional(),
});
/** The Team list query as the client sends it (`q` matches name or e-mail). */
export type UserListQuery = z.input<typeof listUsersQuerySchema>;

/** POST /api/users (invite) */
export const createUserSchema = z.strictObject({ email: emailSchema, name: nameSchema, roles: rolesSchema });
/** Fields of an invitation. */
export type InviteUserBody = z.input<typeof createUserSchema>;

/** PATCH /api/users/:id — at least one field. */
export const updateUserSchema = z
  .strictObject({
    name: nameSchema.optional(),
    roles: rolesSchema.optional(),
    disabled: z.boolean({ message: 'must be true or false' }).optional(),
  })
  .refine((v) => v.name !== undefined || v.roles !== undefined || v.disabled !== undefined, 'give at least one of name, roles, disabled');
/** Fields an admin may change on a user. */
export type UpdateUserBody = z.input<typeof updateUserSchema>;

/** GET /api/audit?page&pageSize&entity&entityId */
export const listAuditQuerySchema = paginationSchema.extend({
  entity: z.string().trim().min(1).max(64).optional(),
  entityId: z.coerce.number({ message: 'must be a number' }).int().positive().optional(),
});

/** GET /api/outbox?page&pageSize&to */
export const listOutboxQuerySchema = paginationSchema.extend({ to: z.string().trim().max(254).optional() });
/** The Outbox list query as the client sends it. */
export type OutboxListQuery = z.input<typeof listOutboxQuerySchema>;
