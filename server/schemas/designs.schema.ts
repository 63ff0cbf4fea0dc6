// The design request schemas are part of the contract (src/contracts/requests/designs.ts): one declaration for both sides.
export { createDesignSchema, designDocumentSchema, listDesignsQuerySchema, updateDesignSchema } from '@/contracts';
