import type { Check, CheckQuantity, QuantityKind, Severity } from './types';

/** Metric unit each quantity kind is stored and printed in. */
export const UNIT_OF_KIND: Record<QuantityKind, string> = {
  lengthMm: 'mm',
  forceN: 'N',
  speedMPerS: 'm/s',
  accelMPerS2: 'm/s²',
  torqueNm: 'N·m',
  momentNm: 'N·m',
  massKg: 'kg',
  currentA: 'A',
  voltageV: 'V',
  powerW: 'W',
  frequencyHz: 'Hz',
  timeS: 's',
  ratio: '',
  count: '',
  angleDeg: '°',
};

/**
 * A number with three significant figures, but never fewer digits than its whole part (1234, 12.3, 0.0125).
 * @param v - the number
 * @returns its text
 */
export function formatSignificant(v: number): string {
  if (!Number.isFinite(v)) return v > 0 ? '∞' : v < 0 ? '−∞' : '—';
  if (v === 0) return '0';
  const mag = Math.floor(Math.log10(Math.abs(v)));
  const decimals = Math.max(0, 2 - mag);
  const text = v.toFixed(Math.min(decimals, 10));
  return (text.includes('.') ? text.replace(/0+$/, '').replace(/\.$/, '') : text).replace(/^-/, '−');
}

/**
 * One quantity as metric text: a ratio as a percentage, a count as a whole number, the rest with its unit.
 * @param q - value and kind
 * @returns e.g. "12.3 N", "60 %", "45°"
 */
export function renderQuantity(q: CheckQuantity): string {
  if (q.kind === 'ratio') return `${formatSignificant(q.value * 100)} %`;
  if (q.kind === 'count') return String(Math.round(q.value));
  if (q.kind === 'angleDeg') return `${Math.round(q.value)}°`;
  return `${formatSignificant(q.value)} ${UNIT_OF_KIND[q.kind]}`;
}

/** Shorthand for a quantity inside a check's parts. */
export function qty(value: number, kind: QuantityKind): CheckQuantity {
  return { value, kind };
}

/**
 * Builds a check from its parts: the message is the parts rendered in metric, the unit follows the kind.
 * @param c - id, severity, value/limit and their kind, the subject and the text parts
 * @returns the check
 */
export function makeCheck(c: {
  id: string;
  severity: Severity;
  value: number | null;
  limit: number | null;
  kind: QuantityKind;
  subject?: string | null;
  unit?: string;
  parts: (string | CheckQuantity)[];
}): Check {
  return {
    id: c.id,
    severity: c.severity,
    message: c.parts.map((p) => (typeof p === 'string' ? p : renderQuantity(p))).join(''),
    value: c.value,
    limit: c.limit,
    unit: c.unit ?? UNIT_OF_KIND[c.kind],
    kind: c.kind,
    parts: c.parts,
    subject: c.subject ?? null,
  };
}

/**
 * Severity from a failing and a warning condition.
 * @param fail - the check fails
 * @param warn - the check warns (ignored when it fails)
 * @returns severity
 */
export function severityOf(fail: boolean, warn: boolean): Severity {
  return fail ? 'fail' : warn ? 'warn' : 'ok';
}
