// The parts shelf request schemas are part of the contract (src/contracts/requests/parts.ts): the part schemas, their
// PATCH forms, the list query and the torque-table upload fields.
export * from '@/contracts/requests/parts';
