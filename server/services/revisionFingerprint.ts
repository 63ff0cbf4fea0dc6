import { createHash } from 'node:crypto';

// What makes a revision tamper-evident: the same frozen inputs and result always give the same text, hence the same
// SHA-256, on any machine and in any key order (printed on the design sheet, recomputed by anyone holding the JSON).

/**
 * Canonical JSON: object keys sorted at every level, no whitespace, arrays in order, numbers as JSON.stringify
 * writes them (non-finite numbers become null, as in any JSON). Equal data gives equal text.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    const text = JSON.stringify(value);
    return text === undefined ? 'null' : text;
  }
  if (Array.isArray(value))
    return `[${value.map((v) => (v === undefined || typeof v === 'function' ? 'null' : canonicalJson(v))).join(',')}]`;
  const entries = Object.keys(value as Record<string, unknown>)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined && typeof (value as Record<string, unknown>)[k] !== 'function')
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`);
  return `{${entries.join(',')}}`;
}

/** The fingerprint of a revision: SHA-256 (hex) of the canonical JSON of `{ inputs, result }`. */
export function revisionFingerprint(inputs: unknown, result: unknown): string {
  return createHash('sha256').update(canonicalJson({ inputs, result }), 'utf8').digest('hex');
}
