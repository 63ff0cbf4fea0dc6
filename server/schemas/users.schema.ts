// The team, audit and outbox request schemas are part of the contract (src/contracts/requests/users.ts).
export { createUserSchema, listAuditQuerySchema, listOutboxQuerySchema, listUsersQuerySchema, updateUserSchema } from '@/contracts';
