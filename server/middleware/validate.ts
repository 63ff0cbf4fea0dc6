import type { RequestHandler } from 'express';
import type { z, ZodError } from 'zod';
import { validationError, type ErrorDetail } from '../errors';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

/** Turns zod issues into `[{ path: 'field.sub', message }]`. An issue on the whole value gets `rootName`. */
export function zodDetails(error: ZodError, rootName = 'body'): ErrorDetail[] {
  return error.issues.flatMap((issue): ErrorDetail[] => {
    const prefix = issue.path.map(String).join('.');
    // Name each unknown field rather than reporting "Unrecognized key" on the parent object.
    if (issue.code === 'unrecognized_keys') {
      return issue.keys.map((key) => ({ path: prefix ? `${prefix}.${key}` : key, message: 'is not a known field' }));
    }
    if (issue.code === 'invalid_type' && !prefix && issue.expected === 'object') {
      return [{ path: rootName, message: rootName === 'body' ? 'must be a JSON object' : 'must be an object' }];
    }
    return [{ path: prefix || rootName, message: issue.message }];
  });
}

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
export function validate(schemas: Schemas): RequestHandler & { schemas: Schemas } {
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
  return Object.assign(validateMiddleware, { schemas });
}
