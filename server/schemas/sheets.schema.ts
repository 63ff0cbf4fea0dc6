// The sheet request schemas are part of the contract (src/contracts/requests/sheets.ts).
export { listSheetsQuerySchema, sheetPdfQuerySchema } from '@/contracts';
