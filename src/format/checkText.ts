import type { Check, CheckQuantity, QuantityKind } from '@/engine';
import { formatKind, kindFromUnit } from './formatKind';
import { formatNumber, RESULT_DIGITS } from './formatNumber';
import type { UnitSystem } from './unitSystem';

/**
 * Checks whose value and limit are shares (0.6 = 60 %) but that older results report with an empty unit. Results
 * that carry `kind` do not need this list.
 */
const RATIO_CHECKS = new Set(['torque-margin', 'travel-vs-frame']);

/** The id of a check without a per-part suffix ("belt-slack-side:A" → "belt-slack-side"). */
const baseId = (id: string): string => id.split(':')[0];

/**
 * The kind of a check's value and limit: its own `kind`, else one read from its unit string; null when unknown.
 * @param check - a check of a result
 */
export function checkKind(check: Pick<Check, 'id' | 'unit' | 'kind'>): QuantityKind | null {
  if (check.kind) return check.kind;
  if (check.unit === '' && RATIO_CHECKS.has(baseId(check.id))) return 'ratio';
  return kindFromUnit(check.unit);
}

/**
 * Renders message parts in a unit system: text as it is, each quantity in the reader's units with three
 * significant figures ("Cruise speed 300 mm/s is above …").
 * @param parts - text pieces and quantities
 * @param system - metric or imperial
 */
export function renderParts(parts: readonly (string | CheckQuantity)[], system: UnitSystem): string {
  return parts.map((p) => (typeof p === 'string' ? p : formatKind(p.value, p.kind, system))).join('');
}

/** A check as people read it: the message and the value and limit, all in one unit system. */
export interface CheckText {
  message: string;
  value: string;
  limit: string;
}

/**
 * A check's message, value and limit in the reader's unit system. The message comes from `parts` when the result
 * has them (older results fall back to the metric `message`); value and limit share one unit, chosen from both.
 * @param check - a check of a result
 * @param system - metric or imperial
 */
export function checkText(check: Check, system: UnitSystem): CheckText {
  const message = check.parts && check.parts.length ? renderParts(check.parts, system) : check.message;
  const kind = checkKind(check);
  const together = [check.value, check.limit];
  const show = (v: number | null): string => {
    if (v === null || v === undefined) return '—';
    if (kind) return formatKind(v, kind, system, { together });
    const number = formatNumber(v, RESULT_DIGITS);
    return check.unit ? `${number}\u00a0${check.unit}` : number;
  };
  return { message, value: show(check.value), limit: show(check.limit) };
}
