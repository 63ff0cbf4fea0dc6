import { z } from 'zod';
import { paginationSchema } from './common.schema';

/** The multipart form of an attachment upload: the file and nothing else. */
export const attachmentUploadBodySchema = z.strictObject({}).optional();

/** `?page&pageSize`: 100 per page by default (a design has a handful of files). */
export const attachmentListQuerySchema = paginationSchema.extend({ pageSize: paginationSchema.shape.pageSize.unwrap().default(100) });
