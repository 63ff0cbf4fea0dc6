/** One page of a list: the shape every list endpoint answers (`{ items, total, page, pageSize }`). */
export type Page<T> = { items: T[]; total: number; page: number; pageSize: number };
