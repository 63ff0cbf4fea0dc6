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

/** `?page&pageSize` with defaults 1 and 20 (at most 100 per page). */
export const paginationSchema = z.object({
  page: z.coerce.number({ message: 'must be a number' }).int('must be a whole number').min(1, 'must be 1 or more').default(1),
  pageSize: z.coerce
    .number({ message: 'must be a number' })
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

/**
 * A new password: 10 characters or more, and at most 72 bytes (bcrypt ignores anything past 72 bytes,
 * so a longer one would silently not count).
 */
export const newPasswordSchema = z
  .string({ message: 'is required' })
  .min(10, 'must be at least 10 characters')
  .refine((p) => Buffer.byteLength(p, 'utf8') <= 72, 'must be at most 72 bytes');

export type Pagination = z.infer<typeof paginationSchema>;
