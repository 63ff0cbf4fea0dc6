import type { PartInputOf, PartOf, PartShelf } from '@/contracts';
import { get, patch, post } from './http';

export { PULLEY_KIND_LABELS } from '@/contracts';
export type { BeltPart, MotorPart, PartOf, PulleyKind, PulleyPart } from '@/contracts';
/** The three shelves of the Parts shelf (the client's name for the contract's PartShelf). */
export type PartKind = PartShelf;

/** Fields sent when adding or editing a part: the contract's part schema of the shelf (retired only on edit). */
export type PartInput<K extends PartKind> = PartInputOf[K] & { retired?: boolean };

function itemsOf<T>(body: T[] | { items: T[] }): T[] {
  return Array.isArray(body) ? body : body.items;
}

/** Lists one shelf; retired parts only when asked. */
export const listParts = async <K extends PartKind>(kind: K, includeRetired = false): Promise<PartOf[K][]> =>
  itemsOf(
    await get<PartOf[K][] | { items: PartOf[K][] }>(`/parts/${kind}`, { includeRetired: includeRetired ? 1 : undefined, pageSize: 100 }),
  );

/** Adds a part to a shelf (admin). */
export const createPart = <K extends PartKind>(kind: K, input: PartInput<K>): Promise<PartOf[K]> => post(`/parts/${kind}`, input);

/** Edits or retires a part (admin); `{ retired: true }` retires it. */
export const updatePart = <K extends PartKind>(kind: K, id: number, input: Partial<PartInput<K>>): Promise<PartOf[K]> =>
  patch(`/parts/${kind}/${id}`, input);
