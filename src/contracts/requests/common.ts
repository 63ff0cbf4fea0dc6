// Request pieces every resource shares: ids in paths, paging, e-mail addresses.
import { z } from 'zod';

const MAX_INT = 2_147_483_647;

/** A positive integer in a route parameter: digits only, no sign, exponent, spaces or hex. */
export const idSchema = z
  .string()
  .regex(/^[1-9][0-9]{0,9}$/, 'must be a positive whole number')
  .transform(Number)
  .refine((n) => n <= MAX_INT, 'is too large');

/** `{ id }` route params. Use with `validate({ params: idParamsSchema })`. */
export const idParamsSchema = z.object({ id: idSchema });

/** `?page&pageSize` with defaults 1 and 20 (at most 100 per page). The client sends numbers; they arrive as text. */
export const paginationSchema = z.object({
  page: z.coerce
    .number<number | string>({ message: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be 1 or more')
    .default(1),
  pageSize: z.coerce
    .number<number | string>({ message: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be 1 or more')
    .max(100, 'must be 100 or less')
    .default(20),
});

/** A trimmed, lower-cased e-mail address. */
export const emailSchema = z
  .string({ message: 'is required' })
  .trim()
  .toLowerCase()
  .max(254, 'must be at most 254 characters')
  .pipe(z.email({ message: 'must be an e-mail address' }));

/** A comma-separated list of allowed values (`?status=draft,returned`), read as a list. */
export function listOf<T extends string>(values: readonly T[]) {
  return z
    .string({ message: 'must be a single value or a comma-separated list' })
    .transform((v) =>
      v
        .split(',')
        .map((s) => s.trim())
        .filter(Boolean),
    )
    .refine(
      (list) => list.length > 0 && list.every((v) => (values as readonly string[]).includes(v)),
      `must be one or more of ${values.join(', ')}`,
    )
    .transform((list) => list as T[]);
}
