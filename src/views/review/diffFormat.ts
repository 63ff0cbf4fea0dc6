import { formatNumber, formatQuantity, type QuantityKey, type UnitSystem } from '@/format';

/**
 * A key result of the diff in a unit system: the server names its display quantity and stored unit; older diffs
 * without them show the number with its unit string.
 * @param value - the result (null when a revision lacks it)
 * @param row - the quantity and stored unit of the row, or the unit string of an older diff
 * @param system - metric or imperial
 */
export function formatResult(
  value: number | null,
  row: { quantity?: QuantityKey | null; stored?: string | null; unit: string },
  system: UnitSystem,
): string {
  if (value === null) return '—';
  if (row.quantity) return formatQuantity(value, row.quantity, row.stored ?? '', system, 3);
  return row.unit ? `${formatNumber(value, 3)}\u00a0${row.unit}` : formatNumber(value, 3);
}

/**
 * The change between two numbers as a signed percentage ("+12.5 %"), or "" when either is missing or zero.
 */
export function relativeChange(before: number | null, after: number | null): string {
  if (before === null || after === null || before === 0) return '';
  const pct = ((after - before) / Math.abs(before)) * 100;
  if (Math.abs(pct) < 0.05) return '±0\u00a0%';
  return `${pct > 0 ? '+' : '−'}${formatNumber(Math.abs(pct), 3)}\u00a0%`;
}
