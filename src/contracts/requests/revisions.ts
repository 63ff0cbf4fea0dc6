// What the client sends to the review workflow: submit, the review desk list, comments, approve and return.
import { z } from 'zod';
import { UNIT_SYSTEMS } from '@/format';
import { REVISION_STATUSES } from '../enums';
import { idSchema, listOf, paginationSchema } from './common';

/**
 * POST /api/designs/:id/submit {version?, sheetUnits?}: `version`, when given, must be the design version the designer
 * sees; `sheetUnits` is the unit system the design sheet will be printed in (metric by default).
 */
export const submitDesignSchema = z
  .strictObject({
    version: z
      .number({ message: 'must be the design version you last saw' })
      .int('must be a whole number')
      .min(1, 'must be 1 or more')
      .optional(),
    sheetUnits: z.enum(UNIT_SYSTEMS, { message: `must be one of ${UNIT_SYSTEMS.join(', ')}` }).optional(),
  })
  .optional()
  .transform((v) => v ?? {});

/** An empty body (or `{}`): withdraw and reopen take no fields. */
export const emptyBodySchema = z
  .strictObject({})
  .optional()
  .transform(() => ({}));

/** GET /api/revisions?status=in_review,returned&designId&page&pageSize */
export const listRevisionsQuerySchema = paginationSchema.extend({
  status: listOf(REVISION_STATUSES).optional(),
  designId: idSchema.optional(),
});

/** The review desk list query as the client sends it (`status`: one status or a comma-separated list). */
export type RevisionListQuery = z.input<typeof listRevisionsQuerySchema>;

const text = (what: string, max: number) =>
  z
    .string({ message: `is required: ${what}` })
    .trim()
    .max(max, `must be at most ${max} characters`);

/** POST /api/revisions/:id/comments {body, parentId?} */
export const createCommentSchema = z.strictObject({
  body: text('the text of the comment', 5000).min(1, 'must not be empty'),
  parentId: z
    .number({ message: 'must be the id of the comment you answer' })
    .int('must be a whole number')
    .positive('must be a comment id')
    .nullable()
    .optional(),
});

/**
 * POST /api/revisions/:id/approve {comment?, justification?}: the comment is printed on the sheet (may be empty). The
 * justification is required when a check of the revision failed (the service checks that, knowing the result).
 */
export const approveSchema = z
  .strictObject({
    comment: z.string({ message: 'must be text' }).trim().max(2000, 'must be at most 2000 characters').default(''),
    justification: z.string({ message: 'must be text' }).trim().max(4000, 'must be at most 4000 characters').default(''),
  })
  .optional()
  .transform((v) => v ?? { comment: '', justification: '' });

/** POST /api/revisions/:id/return {reason}: required, so the designer knows what to change. */
export const returnSchema = z.strictObject({
  reason: text('say what the designer should change', 4000).min(1, 'is required: say what the designer should change'),
});
