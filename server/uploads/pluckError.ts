/** Why a pluck recording could not be measured. */
export type PluckErrorCode = 'unsupported_format' | 'too_long' | 'no_tone' | 'corrupt';

/**
 * A recording that cannot be measured. `message` is written for the maker holding the phone,
 * so a route can show it as is (the server answers these with 422).
 */
export class PluckError extends Error {
  /** Machine-readable reason. */
  readonly code: PluckErrorCode;
  /** HTTP status a route should answer with. */
  readonly httpStatus = 422;

  constructor(code: PluckErrorCode, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'PluckError';
    this.code = code;
  }
}
