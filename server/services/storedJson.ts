/**
 * A JSON column as the driver hands it back: MariaDB stores JSON as LONGTEXT, so a row may carry the text or (after a
 * write in the same process) the object itself.
 */
export function parseJson<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T;
}
