// Shapes every part of the API shares: pages, people named in an answer, the error body.

/** One page of a list: the shape every list endpoint answers (`{ items, total, page, pageSize }`). */
export type Page<T> = { items: T[]; total: number; page: number; pageSize: number };

/** Someone named in an answer. */
export type PersonRef = { id: number; name: string };

/** One entry of a validation error: which field (dotted path, e.g. `"roles.0"`) and what is wrong with it. */
export type ErrorDetail = { path: string; message: string };

/**
 * What an error body's `details` may hold: usually a list of field issues, but some errors carry a structured
 * object instead (a version conflict says who saved and when).
 */
export type ErrorDetails = ErrorDetail[] | Record<string, unknown>;

/** The body every API failure answers with. */
export type ErrorBody = { error: { code: string; message: string; details?: ErrorDetails } };
