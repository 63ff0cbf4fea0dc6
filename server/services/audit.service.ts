import type { Page } from '@/contracts';
import type { Transaction } from 'sequelize';
import { AuditLog, User } from '../models';

/** What a caller records; the time is set by the database row. */
export type AuditInput = {
  actorId: number | null;
  action: string;
  entity: string;
  entityId?: number | null;
  fromState?: string | null;
  toState?: string | null;
  reason?: string | null;
};

/** One audit entry as the API shows it. */
export type AuditEntry = {
  id: number;
  actor: { id: number; name: string; email: string } | null;
  action: string;
  entity: string;
  entityId: number | null;
  from: string | null;
  to: string | null;
  reason: string | null;
  at: string;
};

/** Appends an audit entry. Pass the transaction of the change it records, so both commit together. */
export async function recordAudit(input: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditLog.create(
    {
      actorId: input.actorId,
      action: input.action,
      entity: input.entity,
      entityId: input.entityId ?? null,
      fromState: input.fromState ?? null,
      toState: input.toState ?? null,
      reason: input.reason ?? null,
    },
    { transaction },
  );
}

/** Lists the audit log, newest first, optionally for one entity. */
export async function listAudit(query: { page: number; pageSize: number; entity?: string; entityId?: number }): Promise<Page<AuditEntry>> {
  const where: Record<string, unknown> = {};
  if (query.entity) where.entity = query.entity;
  if (query.entityId !== undefined) where.entityId = query.entityId;
  const { rows, count } = await AuditLog.findAndCountAll({
    where,
    include: [{ model: User, as: 'actor', attributes: ['id', 'name', 'email'] }],
    order: [['id', 'DESC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  const items = rows.map((row) => {
    const actor = (row as AuditLog & { actor?: User | null }).actor;
    return {
      id: row.id,
      actor: actor ? { id: actor.id, name: actor.name, email: actor.email } : null,
      action: row.action,
      entity: row.entity,
      entityId: row.entityId,
      from: row.fromState,
      to: row.toState,
      reason: row.reason,
      at: new Date(row.createdAt).toISOString(),
    };
  });
  return { items, total: count, page: query.page, pageSize: query.pageSize };
}
