import { UNIT_TABLE } from './unitTable';

/**
 * Physical quantities the UI shows, with the unit each one is displayed in per unit system, and the
 * conversions between a stored value (SI or mm, as the design document and the engine keep it) and the
 * displayed one. Every factor comes from one library, mathjs, through a table computed with it
 * (unitTable.ts, written by scripts/genUnitTable.ts and checked against mathjs by a test), so that pages do not
 * download mathjs itself to convert millimetres to inches.
 */

/** The two unit systems a person can pick. */
export type UnitSystem = 'metric' | 'imperial';

/** Every unit system, in the order the toggle shows them. */
export const UNIT_SYSTEMS: readonly UnitSystem[] = ['metric', 'imperial'];

/** How one quantity is shown in one system: mathjs unit string and the label printed beside numbers. */
interface DisplayUnit {
  unit: string;
  label: string;
}

/** A quantity: its display unit per system. */
interface QuantityDef {
  metric: DisplayUnit;
  imperial: DisplayUnit;
}

const same = (unit: string, label: string): QuantityDef => ({ metric: { unit, label }, imperial: { unit, label } });

/**
 * Display units per quantity. Keys name what is measured; the stored unit is given per field, because the
 * design keeps some accelerations in mm/s² and the engine reports others in m/s².
 */
export const QUANTITIES = {
  length: { metric: { unit: 'mm', label: 'mm' }, imperial: { unit: 'in', label: 'in' } },
  /** Microstep travel and ringing amplitudes: µm / thousandths of an inch. */
  lengthFine: { metric: { unit: 'um', label: 'µm' }, imperial: { unit: 'mil', label: 'thou' } },
  mass: { metric: { unit: 'kg', label: 'kg' }, imperial: { unit: 'lb', label: 'lb' } },
  /** Small masses (motors): g / oz. */
  massSmall: { metric: { unit: 'g', label: 'g' }, imperial: { unit: 'oz', label: 'oz' } },
  linearMass: { metric: { unit: 'g/m', label: 'g/m' }, imperial: { unit: 'oz/ft', label: 'oz/ft' } },
  force: { metric: { unit: 'N', label: 'N' }, imperial: { unit: 'lbf', label: 'lbf' } },
  torque: { metric: { unit: 'N m', label: 'N·m' }, imperial: { unit: 'ozf in', label: 'oz·in' } },
  inertia: { metric: { unit: 'g cm^2', label: 'g·cm²' }, imperial: { unit: 'oz in^2', label: 'oz·in²' } },
  speed: { metric: { unit: 'mm/s', label: 'mm/s' }, imperial: { unit: 'in/s', label: 'in/s' } },
  accel: { metric: { unit: 'm/s^2', label: 'm/s²' }, imperial: { unit: 'in/s^2', label: 'in/s²' } },
  perLength: { metric: { unit: 'mm^-1', label: 'steps/mm' }, imperial: { unit: 'in^-1', label: 'steps/in' } },
  stiffness: { metric: { unit: 'N/mm', label: 'N/mm' }, imperial: { unit: 'lbf/in', label: 'lbf/in' } },
  frequency: same('Hz', 'Hz'),
  rotSpeed: same('', 'rev/s'),
  voltage: same('V', 'V'),
  current: same('A', 'A'),
  resistance: same('ohm', 'Ω'),
  inductance: same('mH', 'mH'),
  angle: same('', '°'),
  teeth: same('', 'teeth'),
  count: same('', ''),
  ratio: same('', ''),
  percent: same('', '%'),
  /** Second moment of area of a beam section. */
  secondMoment: { metric: { unit: 'mm^4', label: 'mm⁴' }, imperial: { unit: 'in^4', label: 'in⁴' } },
  /** Elastic moduli: GPa / million psi. */
  modulus: { metric: { unit: 'GPa', label: 'GPa' }, imperial: { unit: 'Mpsi', label: 'Mpsi' } },
  jerk: { metric: { unit: 'm/s^3', label: 'm/s³' }, imperial: { unit: 'in/s^3', label: 'in/s³' } },
  power: same('W', 'W'),
  time: same('s', 's'),
  /** Short times (shaper delays, ramps): ms. */
  timeShort: same('ms', 'ms'),
} as const satisfies Record<string, QuantityDef>;

/** Key of a quantity in {@link QUANTITIES}. */
export type QuantityKey = keyof typeof QUANTITIES;

const factorCache = new Map<string, number>();

/**
 * Factor f such that value[to] = value[from] × f. Both units must measure the same thing.
 * An empty unit string means "no unit" and only converts to itself.
 * @param from - mathjs unit string of the value
 * @param to - mathjs unit string wanted
 * @returns the multiplication factor
 */
export function conversionFactor(from: string, to: string): number {
  if (from === to) return 1;
  const key = `${from}→${to}`;
  const cached = factorCache.get(key);
  if (cached !== undefined) return cached;
  if (!from || !to) throw new Error(`[conversionFactor] cannot convert "${from}" to "${to}"`);
  const a = UNIT_TABLE[from];
  const b = UNIT_TABLE[to];
  if (!a || !b) throw new Error(`[conversionFactor] unknown unit "${a ? to : from}": add it to scripts/genUnitTable.ts and run it`);
  if (a.dim !== b.dim) throw new Error(`[conversionFactor] cannot convert "${from}" to "${to}": they measure different things`);
  const factor = a.si / b.si;
  factorCache.set(key, factor);
  return factor;
}

/**
 * Converts a value between two units (factors computed with mathjs, see unitTable.ts).
 * @param value - the amount in `from`
 * @param from - mathjs unit string, e.g. "mm"
 * @param to - mathjs unit string, e.g. "in"
 * @returns the amount in `to`
 */
export function convert(value: number, from: string, to: string): number {
  return value * conversionFactor(from, to);
}

/**
 * The display unit of a quantity in a system.
 * @returns mathjs unit string and label
 */
export function displayUnit(quantity: QuantityKey, system: UnitSystem): DisplayUnit {
  return QUANTITIES[quantity][system];
}

/**
 * Converts a stored value to the number shown in the given system.
 * @param value - stored value in `stored`
 * @param quantity - what it measures
 * @param stored - mathjs unit string of the stored value ("" for unitless)
 * @param system - metric or imperial
 */
export function toDisplay(value: number, quantity: QuantityKey, stored: string, system: UnitSystem): number {
  const target = QUANTITIES[quantity][system].unit;
  if (!target) return value;
  return convert(value, stored, target);
}

/**
 * Converts a number typed in the given system back to the stored unit.
 * @param value - amount in the display unit
 * @param quantity - what it measures
 * @param stored - mathjs unit string the value is stored in
 * @param system - metric or imperial
 */
export function fromDisplay(value: number, quantity: QuantityKey, stored: string, system: UnitSystem): number {
  const source = QUANTITIES[quantity][system].unit;
  if (!source) return value;
  return convert(value, source, stored);
}

const GROUPED_INT = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });

/**
 * Rounds a number for reading: whole numbers from 1000 up (with thousands separators), four significant
 * digits below that, three for very small values; trailing zeros dropped. "—" for null, NaN or ±∞.
 * @param value - the number to show
 * @param significant - significant digits below 1000 (default 4)
 * @returns the formatted number, e.g. "18.11", "12,346", "0.000246"
 */
export function formatNumber(value: number | null | undefined, significant = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 1000) return GROUPED_INT.format(value).replace('-', '−');
  const digits = abs < 0.001 ? Math.min(significant, 3) : significant;
  const text = Number(value.toPrecision(digits)).toString();
  // toString switches to exponent notation below 1e-6; keep plain decimals for people.
  if (text.includes('e')) return value.toFixed(Math.min(20, Math.ceil(-Math.log10(abs)) + digits - 1)).replace(/\.?0+$/, '');
  return text.replace('-', '−');
}

/**
 * Formats a number for an input box: up to six significant digits, plain decimals, no separators, so that
 * typing it back gives the same stored value to well within any tolerance that matters.
 * @param value - number in the display unit
 */
export function formatForInput(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  if (value === 0) return '0';
  const text = Number(value.toPrecision(6)).toString();
  if (!text.includes('e')) return text;
  const abs = Math.abs(value);
  return abs < 1 ? value.toFixed(Math.min(20, Math.ceil(-Math.log10(abs)) + 5)).replace(/\.?0+$/, '') : value.toFixed(0);
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
  const label = QUANTITIES[quantity][system].label;
  const text = formatNumber(toDisplay(value, quantity, stored, system), significant);
  if (!label) return text;
  return label === '°' || label === '%' ? `${text}${label}` : `${text}\u00a0${label}`;
}
