import { QUANTITIES, toDisplay, type QuantityKey } from './displayUnits';
import { formatNumber } from './formatNumber';
import type { UnitSystem } from './unitSystem';

/** A non-breaking space: a number and its unit never break apart. */
export const NBSP = '\u00a0';

/**
 * Joins a formatted number and its unit label the way they are printed: "18.11 in", "45°" (degrees close up;
 * everything else, the percent sign too, after a non-breaking space).
 * @param number - the formatted number
 * @param label - the unit label ("" for none)
 */
export function withUnit(number: string, label: string): string {
  if (!label || number === '—') return number;
  return label === '°' ? `${number}${label}` : `${number}${NBSP}${label}`;
}

/**
 * Formats a stored value in a system with its unit label: "18.11 in", "3.2 mH".
 * @param value - stored value
 * @param quantity - what it measures
 * @param stored - mathjs unit string of the stored value
 * @param system - metric or imperial
 * @param significant - significant digits (default 4)
 */
export function formatQuantity(
  value: number | null | undefined,
  quantity: QuantityKey,
  stored: string,
  system: UnitSystem,
  significant = 4,
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return withUnit(formatNumber(toDisplay(value, quantity, stored, system), significant), QUANTITIES[quantity][system].label);
}
