import { storeToRefs } from 'pinia';
import { useUnitsStore } from '@/stores/units';
import { displayUnit, formatQuantity, fromDisplay, toDisplay, type QuantityKey, type UnitSystem } from '@/format';

/**
 * Unit conversions bound to the person's chosen system (the units store).
 * @returns `system` (ref), `label(q)`, `unit(q)`, `toShown(v, q, stored)`, `fromShown(v, q, stored)`,
 *   `format(v, q, stored, significant?)` and `setSystem`
 */
export function useUnits() {
  const store = useUnitsStore();
  const { system } = storeToRefs(store);

  /** Label printed beside numbers of a quantity ("mm", "oz·in"). */
  const label = (q: QuantityKey): string => displayUnit(q, system.value).label;
  /** mathjs unit string of a quantity in the chosen system. */
  const unit = (q: QuantityKey): string => displayUnit(q, system.value).unit;
  /** Stored value → shown number. */
  const toShown = (value: number, q: QuantityKey, stored: string): number => toDisplay(value, q, stored, system.value);
  /** Typed number → stored value. */
  const fromShown = (value: number, q: QuantityKey, stored: string): number => fromDisplay(value, q, stored, system.value);
  /** Stored value → "18.11 in". */
  const format = (value: number | null | undefined, q: QuantityKey, stored: string, significant?: number): string =>
    formatQuantity(value, q, stored, system.value, significant);
  /** Picks a unit system. */
  const setSystem = (value: UnitSystem): void => store.setSystem(value);

  return { system, label, unit, toShown, fromShown, format, setSystem };
}
