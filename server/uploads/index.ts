// The only way into server/uploads: pure processing of uploaded files (no HTTP, no database).
export { analysePluck, PLUCK_DEFAULT_MAX_HZ, PLUCK_DEFAULT_MIN_HZ } from './analysePluck';
export type { AnalysePluckOptions, PluckAnalysis } from './analysePluck';
export { PluckError } from './pluckError';
export type { PluckErrorCode } from './pluckError';
export { decodeWav, PLUCK_WAV_LIMITS } from './decodeWav';
export type { DecodedWav, DecodeWavLimits, WavSampleFormat } from './decodeWav';
export { CsvError, parseTorqueCsv, TORQUE_CSV_LIMITS, torqueCsvUnitFactor } from './torqueCsv';
export type { CsvErrorDetail, TorqueCsvSpeedUnit, TorqueCsvTorqueUnit, TorquePoint, TorqueTable } from './torqueCsv';
export { assertTypeMatches, sniffType, UploadTypeError } from './sniffType';
export type { SniffedMime, SniffedType, UploadTypeErrorCode } from './sniffType';
export { assertSha256, ContentStoreError, contentPath, readBytes, removeBytes, sha256Of, storeBytes } from './contentStore';
export type { ContentStoreErrorCode, StoredContent } from './contentStore';
export { parseJobCsv, JOB_CSV_LIMITS } from './jobCsv';
export type { JobCsvLengthUnit, JobCsvTimeUnit, JobCsvPoint, JobTable } from './jobCsv';
