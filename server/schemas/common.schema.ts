import { z } from 'zod';
import { passwordProblems } from '../security/passwordPolicy';

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
 * A new password, checked against the password policy (security/passwordPolicy.ts): 12 characters or more, at most
 * 72 bytes, not a common password. Whose it is (name, e-mail) is checked once the account is known.
 */
export const newPasswordSchema = z.string({ message: 'is required' }).superRefine((password, ctx) => {
  for (const message of passwordProblems(password)) ctx.addIssue({ code: 'custom', message });
});

export type Pagination = z.infer<typeof paginationSchema>;
