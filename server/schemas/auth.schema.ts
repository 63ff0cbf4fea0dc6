import { z } from 'zod';
import { emailSchema, newPasswordSchema } from './common.schema';

/** POST /api/auth/login */
export const loginSchema = z.strictObject({
  email: emailSchema,
  password: z.string({ message: 'is required' }).min(1, 'is required').max(1000, 'is too long'),
});

/** POST /api/auth/forgot */
export const forgotSchema = z.strictObject({ email: emailSchema });

/** POST /api/auth/reset (reset and invitation links both end here) */
export const resetSchema = z.strictObject({
  token: z.string({ message: 'is required' }).min(1, 'is required').max(200, 'is too long'),
  password: newPasswordSchema,
});
