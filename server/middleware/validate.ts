import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { validationError, zodDetails, type ErrorDetail } from '../errors';

export { zodDetails };

/** The zod schemas of the request parts a route checks. */
export type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

/**
 * What a part holds after {@link validate}: the schema's output; a part it does not check is left open (`object`),
 * so a second `validate` on the same route (params before an upload, body after it) does not fight the first.
 */
type PartOf<S extends Schemas, K extends keyof Schemas, Unchecked> = S[K] extends z.ZodType ? z.output<S[K]> : Unchecked;

/**
 * The type of a middleware that sits beside {@link validate} on a route (guards, uploads): it reads no typed part, so
 * it accepts any request and lets Express infer the route's parts from `validate` alone.
 */
export type RouteMiddleware = RequestHandler<object, unknown, unknown, object>;

/**
 * Declares a middleware that never reads the typed parts as a {@link RouteMiddleware}. Express hands every handler of
 * a route the same request object; only the static types differ, so this is a type-level statement, not a conversion.
 */
export function asRouteMiddleware<H extends RequestHandler>(handler: H): RouteMiddleware & Omit<H, never> {
  return handler as unknown as RouteMiddleware & Omit<H, never>;
}

/**
 * The handler type {@link validate} returns. Express infers the following handlers' `req.params`, `req.body` and
 * `req.query` from it, so a route reads the parsed values with their types and without casts.
 */
export type ValidatedHandler<S extends Schemas> = RequestHandler<
  PartOf<S, 'params', object>,
  unknown,
  PartOf<S, 'body', unknown>,
  PartOf<S, 'query', object>
>;

/** What a request part's text field says when it holds a lone surrogate. */
export const MALFORMED_TEXT_MESSAGE = 'contains an unpaired surrogate character (text that is not valid Unicode)';

/** A UTF-16 surrogate without its partner (what String.prototype.isWellFormed, ES2024, looks for). */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const LONE_SURROGATES = new RegExp(LONE_SURROGATE.source, 'g');
const isWellFormed = (text: string) => !LONE_SURROGATE.test(text);
const toWellFormed = (text: string) => text.replace(LONE_SURROGATES, '\uFFFD');

/**
 * Dotted paths of every string in `value` (keys included) that is not well-formed Unicode: a lone UTF-16 surrogate,
 * as JSON's `"\ud800"` escape can carry. MariaDB refuses such text (utf8mb4 has no encoding for it), which used to
 * surface as a 500 (issue 12, item 9). Walks iteratively, so deeply nested junk cannot overflow the stack.
 * @param rootName - the path reported for the value itself when it is such a string
 */
export function malformedTextPaths(value: unknown, rootName: string): string[] {
  const found: string[] = [];
  const stack: Array<{ value: unknown; path: string }> = [{ value, path: '' }];
  while (stack.length) {
    const { value: node, path } = stack.pop()!;
    if (typeof node === 'string') {
      if (!isWellFormed(node)) found.push(path || rootName);
    } else if (node !== null && typeof node === 'object') {
      for (const [key, child] of Object.entries(node as Record<string, unknown>)) {
        const childPath = path ? `${path}.${toWellFormed(key)}` : toWellFormed(key);
        if (!isWellFormed(key)) found.push(childPath);
        stack.push({ value: child, path: childPath });
      }
    }
  }
  return found.reverse();
}

/**
 * Checks one request part the way every route does: text that is not valid Unicode is refused first (naming each
 * such field), then the schema parses it. Shared by {@link validate} and the engine workers, which parse /api/calc
 * bodies themselves (server/workers/tasks.ts).
 * @param part - the name reported for the part itself ("body", "query", "params")
 */
export function parsePart(
  schema: z.ZodType,
  input: unknown,
  part: string,
): { ok: true; data: unknown } | { ok: false; details: ErrorDetail[] } {
  const malformed = malformedTextPaths(input, part);
  if (malformed.length) return { ok: false, details: malformed.map((path) => ({ path, message: MALFORMED_TEXT_MESSAGE })) };
  const result = schema.safeParse(input);
  return result.success ? { ok: true, data: result.data } : { ok: false, details: zodDetails(result.error, part) };
}

/**
 * Validates (and coerces) body, query and route params with zod schemas. On failure answers 400
 * `validation_failed` with every field path; on success replaces the request parts with the parsed values,
 * so handlers read typed, trimmed, defaulted data. Text that is not valid Unicode is refused first, naming the field.
 * The schemas stay readable on the middleware (`.schemas`), so tests can walk the real router and learn what each
 * route takes.
 */
export function validate<const S extends Schemas>(schemas: S): ValidatedHandler<S> & { schemas: S } {
  const validateMiddleware: RequestHandler = function validateMiddleware(req, _res, next) {
    const details: ErrorDetail[] = [];
    const parsed: { body?: unknown; query?: unknown; params?: unknown } = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const input = part === 'body' ? (req.body ?? undefined) : req[part];
      const result = parsePart(schema, input, part);
      if (result.ok) parsed[part] = result.data;
      else details.push(...result.details);
    }
    if (details.length) {
      next(validationError(details));
      return;
    }
    if ('body' in parsed) req.body = parsed.body;
    if ('params' in parsed) req.params = parsed.params as typeof req.params;
    // Express 5 exposes req.query through a getter; shadow it on this request object.
    if ('query' in parsed)
      Object.defineProperty(req, 'query', { value: parsed.query, writable: true, configurable: true, enumerable: true });
    next();
  };
  // The middleware replaced the parts with the parsed values above: this is the one place that knows it.
  return Object.assign(validateMiddleware as unknown as ValidatedHandler<S>, { schemas });
}
