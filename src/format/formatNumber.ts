const GROUPED_INT = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });

/** Significant digits of results people read (enough to compare, few enough to read at a glance). */
export const RESULT_DIGITS = 3;

/**
 * Rounds a number for reading: whole numbers from 1000 up (with thousands separators), `significant` digits below
 * that (three for very small values); trailing zeros dropped; a true minus sign. "—" for null, NaN or ±∞.
 * @param value - the number to show
 * @param significant - significant digits below 1000 (default 4)
 * @returns the formatted number, e.g. "18.11", "12,346", "0.000246"
 */
export function formatNumber(value: number | null | undefined, significant = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0 || Object.is(value, -0)) return '0';
  const abs = Math.abs(value);
  if (abs >= 1000) return GROUPED_INT.format(value).replace('-', '−');
  const digits = abs < 0.001 ? Math.min(significant, 3) : significant;
  const rounded = Number(value.toPrecision(digits));
  if (rounded === 0) return '0';
  // A value just under 1000 may round up to it: group it like the others.
  if (Math.abs(rounded) >= 1000) return GROUPED_INT.format(rounded).replace('-', '−');
  const text = rounded.toString();
  // toString switches to exponent notation below 1e-6; keep plain decimals for people.
  if (text.includes('e'))
    return value
      .toFixed(Math.min(20, Math.ceil(-Math.log10(abs)) + digits - 1))
      .replace(/\.?0+$/, '')
      .replace('-', '−');
  return text.replace('-', '−');
}

/**
 * Formats a number for an input box: the fewest significant digits, from four to six, that stay within 0.01 % of the
 * value, plain decimals, no separators. So 20 mm reads "0.7874 in" (not "0.787402") while a typed 12.345 stays
 * "12.345". The stored value only changes when the person types, so a rounded display never rounds the design.
 * @param value - number in the display unit
 */
export function formatForInput(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  if (value === 0) return '0';
  // Whole numbers stay whole (teeth, grid points, 40000 N) however many digits they have.
  if (Number.isInteger(value)) return value.toString();
  const abs = Math.abs(value);
  let digits = 4;
  while (digits < 6 && Math.abs(Number(value.toPrecision(digits)) - value) > 1e-4 * abs) digits++;
  const rounded = Number(value.toPrecision(digits));
  if (Number.isInteger(rounded)) return rounded.toString();
  const text = rounded.toString();
  if (!text.includes('e')) return text;
  return value.toFixed(Math.min(20, Math.ceil(-Math.log10(abs)) + digits - 1)).replace(/\.?0+$/, '');
}

/**
 * Parses what someone typed: accepts a decimal comma, spaces and a leading "+". Empty → null; anything that
 * is not a number → NaN (the schema then says "must be a number" at the field).
 * @param text - the raw input
 */
export function parseNumberInput(text: string): number | null {
  const t = text.trim().replace(/\s+/g, '').replace(',', '.').replace('−', '-');
  if (t === '') return null;
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(t)) return Number.NaN;
  return Number(t);
}

/**
 * A signed percentage for deviations ("+4.2 %", "−12 %", "±0 %").
 * @param pct - the value in percent
 * @param significant - significant digits (default 2)
 */
export function formatSignedPercent(pct: number | null | undefined, significant = 2): string {
  if (pct === null || pct === undefined || !Number.isFinite(pct)) return '—';
  if (Math.abs(pct) < 0.05) return '±0\u00a0%';
  return `${pct > 0 ? '+' : '−'}${formatNumber(Math.abs(pct), significant)}\u00a0%`;
}
