import {
  beltPartSchema,
  motorPartSchema,
  pulleyPartSchema,
  type ListPartsQuery,
  type Page,
  type PartInput,
  type PartPatch,
  type PublicPart,
} from '@/contracts';
import { Op, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import { AppError, notFound, validationError, zodDetails } from '../errors';
import { getSequelize } from '../db';
import { Part, type PartKind } from '../models';
import { recordAudit } from './audit.service';
import type { PublicUser } from './users.service';

/** URL segment of each shelf (`/api/parts/<shelf>`). */
export const PART_SHELVES: Record<PartKind, 'belts' | 'pulleys' | 'motors'> = { belt: 'belts', pulley: 'pulleys', motor: 'motors' };

/** The fields of each kind in the order the API shows them (name and note are columns, the rest is `data`). */
export const PART_FIELDS: Record<PartKind, readonly string[]> = {
  belt: [
    'profile',
    'standard',
    'pitchMm',
    'widthMm',
    'linearMassKgPerM',
    'axialStiffnessN',
    'allowableTensionN',
    'minPulleyTeeth',
    'source',
  ],
  pulley: ['teeth', 'pitchMm', 'profile', 'kind', 'boreMm', 'inertiaKgM2'],
  motor: [
    'frameMm',
    'stepAngleDeg',
    'holdingTorqueNm',
    'ratedCurrentA',
    'phaseResistanceOhm',
    'phaseInductanceMh',
    'rotorInertiaKgM2',
    'massKg',
    'torqueCurve',
    'torqueCurveConditions',
  ],
};

const FULL_SCHEMA = { belt: beltPartSchema, pulley: pulleyPartSchema, motor: motorPartSchema } as const;

/**
 * A part as the API shows it (src/contracts/parts.ts): `{id, shelf, name, ...kind fields, note, retired, createdAt,
 * updatedAt}`. The kind fields mirror the design document's sub-objects (belt / motor) so a pick fills the form.
 * (`shelf` rather than `kind`, because a pulley has a `kind` of its own: drive / idler-toothed / idler-smooth.)
 */
export type { PublicPart };

/** A motor row in the public shape (the row's kind says which member of the union it is). */
export function toPublicMotor(part: Part): Extract<PublicPart, { shelf: 'motors' }> {
  if (part.kind !== 'motor') throw new Error(`part ${part.id} is a ${part.kind}, not a motor`);
  return toPublicPart(part) as Extract<PublicPart, { shelf: 'motors' }>;
}

/** Converts a row to the public shape. */
export function toPublicPart(part: Part): PublicPart {
  const data = (typeof part.data === 'string' ? JSON.parse(part.data) : part.data) as Record<string, unknown>;
  const fields = Object.fromEntries(PART_FIELDS[part.kind].map((key) => [key, data[key] ?? null]));
  // The kind fields come from the stored JSON, listed by PART_FIELDS (which the shelf's zod schema wrote): the one
  // place the row's loose `data` becomes the contract's shape.
  return {
    id: part.id,
    shelf: PART_SHELVES[part.kind],
    name: part.name,
    ...fields,
    note: part.note ?? '',
    retired: Boolean(part.retired),
    createdAt: new Date(part.createdAt).toISOString(),
    updatedAt: new Date(part.updatedAt).toISOString(),
  } as PublicPart;
}

function splitInput(kind: PartKind, input: Record<string, unknown>): { name: string; note: string; data: Record<string, unknown> } {
  const data = Object.fromEntries(PART_FIELDS[kind].map((key) => [key, input[key] ?? null]));
  return { name: String(input.name), note: String(input.note ?? ''), data };
}

function nameTaken(kind: PartKind, name: string): AppError {
  return new AppError('part_name_taken', `A ${kind} named "${name}" is already on the shelf.`, 409, {
    details: [{ path: 'name', message: `is already used by another ${kind}` }],
  });
}

async function assertNameFree(kind: PartKind, name: string, exceptId?: number, transaction?: Transaction): Promise<void> {
  const where: WhereOptions = { kind, name };
  if (exceptId !== undefined) Object.assign(where, { id: { [Op.ne]: exceptId } });
  if (await Part.findOne({ where, attributes: ['id'], transaction })) throw nameTaken(kind, name);
}

/** Escapes % and _ so a search term matches literally inside LIKE. */
function escapeLike(term: string): string {
  return term.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** Lists one shelf by name; retired parts only with `includeRetired`. */
export async function listParts(kind: PartKind, query: ListPartsQuery): Promise<Page<PublicPart>> {
  const where: Record<string | symbol, unknown> = { kind };
  if (!query.includeRetired) where.retired = false;
  if (query.q) where.name = { [Op.like]: `%${escapeLike(query.q)}%` };
  const { rows, count } = await Part.findAndCountAll({
    where,
    order: [
      ['name', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { items: rows.map(toPublicPart), total: count, page: query.page, pageSize: query.pageSize };
}

async function findPart(kind: PartKind, id: number): Promise<Part> {
  const part = await Part.findOne({ where: { id, kind } });
  if (!part) throw notFound(kind[0].toUpperCase() + kind.slice(1));
  return part;
}

/** One part by id, retired or not (old designs and sheets may still name it). 404 when it is not on this shelf. */
export async function getPart(kind: PartKind, id: number): Promise<PublicPart> {
  return toPublicPart(await findPart(kind, id));
}

/** Adds a part to a shelf (admin). @throws 409 `part_name_taken` when the shelf already has that name. */
export async function createPart(actor: PublicUser, kind: PartKind, input: PartInput): Promise<PublicPart> {
  const { name, note, data } = splitInput(kind, input as Record<string, unknown>);
  await assertNameFree(kind, name);
  try {
    const part = await getSequelize().transaction(async (transaction) => {
      const created = await Part.create(
        { kind, name, note, data, retired: false, createdById: actor.id, updatedById: actor.id },
        { transaction },
      );
      await recordAudit({ actorId: actor.id, action: 'part.create', entity: 'part', entityId: created.id, toState: kind }, transaction);
      return created;
    });
    return toPublicPart(part);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw nameTaken(kind, name);
    throw err;
  }
}

/**
 * Changes some fields of a part and/or retires or restores it (admin). The merged part is validated as a
 * whole, so the shelf never holds a part the Design desk would reject.
 */
export async function updatePart(actor: PublicUser, kind: PartKind, id: number, patch: PartPatch): Promise<PublicPart> {
  const sequelize = getSequelize();
  try {
    const part = await sequelize.transaction(async (transaction) => {
      const row = await Part.findOne({ where: { id, kind }, transaction, lock: transaction.LOCK.UPDATE });
      if (!row) throw notFound(kind[0].toUpperCase() + kind.slice(1));
      const { retired, ...fields } = patch as Record<string, unknown> & { retired?: boolean };
      const current = toPublicPart(row) as unknown as Record<string, unknown>;
      const merged = FULL_SCHEMA[kind].safeParse({
        ...Object.fromEntries([...PART_FIELDS[kind], 'name', 'note'].map((key) => [key, current[key]])),
        ...fields,
      });
      if (!merged.success) throw validationError(zodDetails(merged.error));
      const next = splitInput(kind, merged.data as Record<string, unknown>);
      if (next.name !== row.name) await assertNameFree(kind, next.name, row.id, transaction);

      const wasRetired = Boolean(row.retired);
      row.name = next.name;
      row.note = next.note;
      row.data = next.data;
      if (retired !== undefined) row.retired = retired;
      row.updatedById = actor.id;
      row.changed('data', true);
      await row.save({ transaction });

      if (Object.keys(fields).length > 0) {
        await recordAudit({ actorId: actor.id, action: 'part.update', entity: 'part', entityId: row.id }, transaction);
      }
      if (retired !== undefined && retired !== wasRetired) {
        await recordAudit(
          {
            actorId: actor.id,
            action: retired ? 'part.retire' : 'part.restore',
            entity: 'part',
            entityId: row.id,
            fromState: wasRetired ? 'retired' : 'active',
            toState: retired ? 'retired' : 'active',
          },
          transaction,
        );
      }
      return row;
    });
    return toPublicPart(part);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw nameTaken(kind, String((patch as { name?: string }).name ?? ''));
    throw err;
  }
}
