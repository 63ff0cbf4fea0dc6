/** One problem with an input, located by a dotted path such as "belt.pitchMm". */
export interface InputIssue {
  /** Dotted path of the offending field ("" for the document itself). */
  path: string;
  /** What is wrong, in plain words. */
  message: string;
}

/**
 * Error thrown for invalid domain input. The message carries a scope prefix
 * `[functionName] what is wrong` so a log line says where it came from; `issues`
 * lists every offending field so the API can answer 400 and the CLI exit 2.
 * The engine knows nothing about HTTP: the server maps this class to 400.
 * @see element-plus utils/error.ts throwError(scope, msg) for the prefix style
 */
export class EngineInputError extends Error {
  /** Function that rejected the input. */
  readonly scope: string;
  /** Every offending field with its path. */
  readonly issues: InputIssue[];

  /**
   * @param scope - name of the function that rejected the input
   * @param message - what is wrong (without the prefix)
   * @param issues - offending fields; defaults to one issue at the document root
   */
  constructor(scope: string, message: string, issues?: InputIssue[]) {
    super(`[${scope}] ${message}`);
    this.name = 'EngineInputError';
    this.scope = scope;
    this.issues = issues && issues.length > 0 ? issues : [{ path: '', message }];
  }
}

/**
 * Throws an {@link EngineInputError} with the scope prefix.
 * @param scope - name of the function that rejected the input
 * @param message - what is wrong
 * @param path - dotted path of the offending argument, when there is one
 * @returns never
 */
export function throwInputError(scope: string, message: string, path = ''): never {
  throw new EngineInputError(scope, path ? `${path}: ${message}` : message, [{ path, message }]);
}

/**
 * Checks that a named argument is a finite number inside [min, max] and returns it.
 * Used by the small named functions so that a NaN or a negative length never turns into a silent NaN result.
 * @param scope - calling function's name, for the error prefix
 * @param name - argument name as the caller spelled it (e.g. "teeth")
 * @param value - the value to check [unit of the argument]
 * @param min - smallest allowed value (inclusive unless `exclusiveMin`)
 * @param max - largest allowed value (inclusive)
 * @param exclusiveMin - true when `min` itself is not allowed (e.g. lengths that must be > 0)
 * @returns the value, unchanged
 */
export function requireNumber(scope: string, name: string, value: unknown, min = -Infinity, max = Infinity, exclusiveMin = false): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throwInputError(scope, `must be a finite number, got ${String(value)}`, name);
  }
  if (exclusiveMin ? value <= min : value < min) {
    throwInputError(scope, `must be ${exclusiveMin ? 'greater than' : 'at least'} ${min}, got ${value}`, name);
  }
  if (value > max) throwInputError(scope, `must be at most ${max}, got ${value}`, name);
  return value;
}
