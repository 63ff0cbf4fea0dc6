import { z } from 'zod';
import { passwordProblems } from '../security/passwordPolicy';

// Ids, paging and e-mail addresses are part of the contract (src/contracts/requests); the password policy is the server's.
export { emailSchema, idParamsSchema, idSchema, paginationSchema } from '@/contracts';

/**
 * A new password, checked against the password policy (security/passwordPolicy.ts): 12 characters or more, at most
 * 72 bytes, not a common password. Whose it is (name, e-mail) is checked once the account is known.
 */
export const newPasswordSchema = z.string({ message: 'is required' }).superRefine((password, ctx) => {
  for (const message of passwordProblems(password)) ctx.addIssue({ code: 'custom', message });
});
