import { z } from 'zod';

/** The multipart form of a job upload: the file and the design version the client holds. */
export const jobUploadBodySchema = z.strictObject({
  version: z.coerce.number({ message: 'must be a number' }).int('must be a whole number').min(1, 'must be 1 or more'),
});
