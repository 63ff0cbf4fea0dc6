import type { QuantityKind } from '@/engine';
import { QUANTITIES, RATIO, toDisplay, type QuantityKey } from './displayUnits';
import { formatNumber, RESULT_DIGITS } from './formatNumber';
import { withUnit } from './formatQuantity';
import type { UnitSystem } from './unitSystem';

/** How a value of an engine quantity kind is shown: the display quantity and the unit the engine stores it in. */
export interface KindDisplay {
  quantity: QuantityKey;
  /** mathjs unit string of the engine's value ("" for unitless). */
  stored: string;
}

/** Lengths below this are shown in µm / thou, so a 20 µm tolerance is not "0.02 mm" beside "20 µm" [mm]. */
export const FINE_LENGTH_BELOW_MM = 1;

const BASE: Record<QuantityKind, KindDisplay> = {
  lengthMm: { quantity: 'length', stored: 'mm' },
  forceN: { quantity: 'force', stored: 'N' },
  speedMPerS: { quantity: 'speed', stored: 'm/s' },
  accelMPerS2: { quantity: 'accel', stored: 'm/s^2' },
  torqueNm: { quantity: 'torque', stored: 'N m' },
  momentNm: { quantity: 'moment', stored: 'N m' },
  massKg: { quantity: 'mass', stored: 'kg' },
  currentA: { quantity: 'current', stored: 'A' },
  voltageV: { quantity: 'voltage', stored: 'V' },
  powerW: { quantity: 'power', stored: 'W' },
  frequencyHz: { quantity: 'frequency', stored: 'Hz' },
  timeS: { quantity: 'time', stored: 's' },
  ratio: { quantity: 'percent', stored: RATIO },
  count: { quantity: 'count', stored: '' },
  angleDeg: { quantity: 'angle', stored: '' },
};

/**
 * How to show values of one kind. Values that belong together (a check's value and limit, a table column) share
 * one display unit: lengths are all shown in µm / thou when every one of them is below {@link FINE_LENGTH_BELOW_MM}.
 * @param kind - the engine's quantity kind
 * @param values - the values shown together (in the kind's unit)
 */
export function kindDisplay(kind: QuantityKind, values: readonly (number | null | undefined)[] = []): KindDisplay {
  const base = BASE[kind];
  if (kind !== 'lengthMm') return base;
  const finite = values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v) && v !== 0);
  const isFine = finite.length > 0 && finite.every((v) => Math.abs(v) < FINE_LENGTH_BELOW_MM);
  return isFine ? { ...base, quantity: 'lengthFine' } : base;
}

/**
 * The unit label of a kind in a system ("mm", "lbf", "%"), for table headers and plot axes.
 * @param kind - the engine's quantity kind
 * @param system - metric or imperial
 * @param values - the values the label is for (picks µm / thou for fine lengths)
 */
export function kindLabel(kind: QuantityKind, system: UnitSystem, values: readonly (number | null | undefined)[] = []): string {
  return QUANTITIES[kindDisplay(kind, values).quantity][system].label;
}

/**
 * The number shown for a value of a kind, without its label.
 * @param value - the engine's value (in the kind's unit)
 * @param kind - the engine's quantity kind
 * @param system - metric or imperial
 * @param display - a shared display (from {@link kindDisplay}); by default picked from this value alone
 */
export function kindToShown(
  value: number,
  kind: QuantityKind,
  system: UnitSystem,
  display: KindDisplay = kindDisplay(kind, [value]),
): number {
  return toDisplay(value, display.quantity, display.stored, system);
}

/**
 * Formats an engine value of a kind in the reader's system: "300 mm/s", "11.8 in/s", "164 µm", "60 %".
 * @param value - the engine's value (in the kind's unit); null → "—"
 * @param kind - the engine's quantity kind
 * @param system - metric or imperial
 * @param options.significant - significant digits (default 3)
 * @param options.together - values shown beside this one, sharing its unit (e.g. a check's value and limit)
 */
export function formatKind(
  value: number | null | undefined,
  kind: QuantityKind,
  system: UnitSystem,
  options: { significant?: number; together?: readonly (number | null | undefined)[] } = {},
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const display = kindDisplay(kind, options.together ?? [value]);
  const shown = kindToShown(value, kind, system, display);
  return withUnit(formatNumber(shown, options.significant ?? RESULT_DIGITS), QUANTITIES[display.quantity][system].label);
}

const UNIT_TO_KIND: Record<string, QuantityKind> = {
  mm: 'lengthMm',
  N: 'forceN',
  'N·m': 'torqueNm',
  'm/s²': 'accelMPerS2',
  'm/s': 'speedMPerS',
  kg: 'massKg',
  Hz: 'frequencyHz',
  A: 'currentA',
  V: 'voltageV',
  W: 'powerW',
  s: 'timeS',
  '°': 'angleDeg',
  teeth: 'count',
  '%': 'ratio',
};

/**
 * The kind of a value from the engine's older unit strings ("N", "m/s²", "teeth" …); an empty unit is a ratio when
 * the check says so by its id, else a plain count. Null when the unit is not known.
 * @param unit - unit string of a check
 */
export function kindFromUnit(unit: string): QuantityKind | null {
  return UNIT_TO_KIND[unit] ?? null;
}
