import {
  conversionFactor,
  formatNumber,
  formatKind,
  kindLabel,
  QUANTITIES,
  renderParts,
  toDisplay,
  type QuantityKey,
  type UnitSystem,
} from '@/format';
import type { CheckQuantity, QuantityKind } from '@/engine';

/**
 * The sheet's numbers in one unit system, through the app's one formatting layer (`@/format`): the same units,
 * labels and significant figures as the screen. `n` gives the number only (tables put the unit in the header),
 * `q` the number with its unit, `label` the unit alone.
 */
export interface SheetUnits {
  system: UnitSystem;
  /** Unit label of a quantity ("mm", "in", "N·m", "oz·in"). */
  label(quantity: QuantityKey): string;
  /** The number shown for a stored value, without its unit. */
  n(value: number | null | undefined, quantity: QuantityKey, stored: string, significant?: number): string;
  /** The number and its unit ("18.11 in"). */
  q(value: number | null | undefined, quantity: QuantityKey, stored: string, significant?: number): string;
  /** A stored value converted to the shown unit (for plots). */
  shown(value: number, quantity: QuantityKey, stored: string): number;
  /** Factor from the stored unit to the shown one (for whole series). */
  factor(quantity: QuantityKey, stored: string): number;
  /** An engine quantity kind with its unit ("300 mm/s"), three significant figures. */
  kind(value: number | null | undefined, kind: QuantityKind, together?: readonly (number | null | undefined)[]): string;
  /** The unit label of an engine quantity kind for values shown together. */
  kindLabel(kind: QuantityKind, values?: readonly (number | null | undefined)[]): string;
  /** Text pieces and quantities in this system. */
  parts(parts: readonly (string | CheckQuantity)[]): string;
}

/** Thin space between a number and its unit on the sheet is a plain space: every PDF viewer copies it as text. */
function joined(number: string, label: string): string {
  if (!label || number === '—') return number;
  return label === '°' ? `${number}${label}` : `${number} ${label}`;
}

/**
 * The sheet's unit helper for one system.
 * @param system - metric or imperial
 */
export function sheetUnits(system: UnitSystem): SheetUnits {
  const label = (quantity: QuantityKey): string => QUANTITIES[quantity][system].label;
  const n = (value: number | null | undefined, quantity: QuantityKey, stored: string, significant = 4): string =>
    value === null || value === undefined || !Number.isFinite(value)
      ? '—'
      : formatNumber(toDisplay(value, quantity, stored, system), significant);
  return {
    system,
    label,
    n,
    q: (value, quantity, stored, significant) => joined(n(value, quantity, stored, significant), label(quantity)),
    shown: (value, quantity, stored) => toDisplay(value, quantity, stored, system),
    factor: (quantity, stored) => {
      const unit = QUANTITIES[quantity][system].unit;
      return unit && stored ? conversionFactor(stored, unit) : 1;
    },
    kind: (value, kind, together) => formatKind(value, kind, system, { together }).replace(/\u00a0/g, ' '),
    kindLabel: (kind, values) => kindLabel(kind, system, values),
    parts: (parts) => renderParts(parts, system).replace(/\u00a0/g, ' '),
  };
}
