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

/**
 * Validates (and coerces) body, query and route params with zod schemas. On failure answers 400
 * `validation_failed` with every field path; on success replaces the request parts with the parsed values,
 * so handlers read typed, trimmed, defaulted data.
 */
export function validate(schemas: Schemas): RequestHandler {
  return function validateMiddleware(req, _res, next) {
    const details: ErrorDetail[] = [];
    const parsed: { body?: unknown; query?: unknown; params?: unknown } = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const input = part === 'body' ? (req.body ?? undefined) : req[part];
      const result = schema.safeParse(input);
      if (result.success) parsed[part] = result.data;
      else details.push(...zodDetails(result.error, part));
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
}
