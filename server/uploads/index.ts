// The only way into server/uploads: pure processing of uploaded files (no HTTP, no database).
export { analysePluck, PLUCK_DEFAULT_MAX_HZ } from './analysePluck';
export type { PluckAnalysis } from './analysePluck';
export { PluckError } from './pluckError';
export { decodeWav, PLUCK_WAV_LIMITS } from './decodeWav';
export { CsvError, parseTorqueCsv, TORQUE_CSV_LIMITS, torqueCsvUnitFactor } from './torqueCsv';
export type { CsvErrorDetail, TorquePoint, TorqueTable } from './torqueCsv';
export { assertTypeMatches, sniffType, UploadTypeError } from './sniffType';
export type { SniffedMime } from './sniffType';
export {
  assertSha256,
  ContentStoreError,
  contentPath,
  isSha256,
  readBytes,
  removeBytes,
  sha256Of,
  storeBytes,
  storedFiles,
} from './contentStore';
export type { StoredContent } from './contentStore';
export { parseJobCsv, JOB_CSV_LIMITS } from './jobCsv';
