// The review workflow's request schemas are part of the contract (src/contracts/requests/revisions.ts).
export {
  approveSchema,
  createCommentSchema,
  emptyBodySchema,
  listRevisionsQuerySchema,
  returnSchema,
  submitDesignSchema,
} from '@/contracts';
