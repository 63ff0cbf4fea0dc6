import type { UnitSystem } from './unitSystem';
import { UNIT_TABLE } from './unitTable';

/**
 * Physical quantities people read, with the unit each one is shown in per unit system, and the conversions between
 * a stored value (SI or mm, as the design document and the engine keep it) and the shown one. Every factor comes
 * from one library, mathjs, through a table computed with it (unitTable.ts, written by scripts/genUnitTable.ts and
 * checked against mathjs by a test), so that no conversion constant is typed twice and pages do not download
 * mathjs itself to convert millimetres to inches.
 */

/** How one quantity is shown in one system: mathjs unit string and the label printed beside numbers. */
export interface DisplayUnit {
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
 * Display units per quantity. Keys name what is measured; the stored unit is given per value, because the
 * design keeps some accelerations in mm/s² and the engine reports others in m/s².
 */
export const QUANTITIES = {
  length: { metric: { unit: 'mm', label: 'mm' }, imperial: { unit: 'in', label: 'in' } },
  /** Microstep travel, ringing amplitudes, tolerances: µm / thousandths of an inch. */
  lengthFine: { metric: { unit: 'um', label: 'µm' }, imperial: { unit: 'mil', label: 'thou' } },
  mass: { metric: { unit: 'kg', label: 'kg' }, imperial: { unit: 'lb', label: 'lb' } },
  /** Small masses (motors): g / oz. */
  massSmall: { metric: { unit: 'g', label: 'g' }, imperial: { unit: 'oz', label: 'oz' } },
  linearMass: { metric: { unit: 'g/m', label: 'g/m' }, imperial: { unit: 'oz/ft', label: 'oz/ft' } },
  force: { metric: { unit: 'N', label: 'N' }, imperial: { unit: 'lbf', label: 'lbf' } },
  torque: { metric: { unit: 'N m', label: 'N·m' }, imperial: { unit: 'ozf in', label: 'oz·in' } },
  /** Moments on a frame (racking): N·m / lbf·in. */
  moment: { metric: { unit: 'N m', label: 'N·m' }, imperial: { unit: 'lbf in', label: 'lbf·in' } },
  inertia: { metric: { unit: 'g cm^2', label: 'g·cm²' }, imperial: { unit: 'oz in^2', label: 'oz·in²' } },
  speed: { metric: { unit: 'mm/s', label: 'mm/s' }, imperial: { unit: 'in/s', label: 'in/s' } },
  accel: { metric: { unit: 'm/s^2', label: 'm/s²' }, imperial: { unit: 'in/s^2', label: 'in/s²' } },
  perLength: { metric: { unit: 'mm^-1', label: 'steps/mm' }, imperial: { unit: 'in^-1', label: 'steps/in' } },
  stiffness: { metric: { unit: 'N/mm', label: 'N/mm' }, imperial: { unit: 'lbf/in', label: 'lbf/in' } },
  frequency: same('Hz', 'Hz'),
  rotSpeed: same('', 'rev/s'),
  voltage: same('V', 'V'),
  current: same('A', 'A'),
  power: same('W', 'W'),
  time: same('s', 's'),
  resistance: same('ohm', 'Ω'),
  inductance: same('mH', 'mH'),
  angle: same('', '°'),
  teeth: same('', 'teeth'),
  count: same('', ''),
  ratio: same('', ''),
  /** A share stored as a fraction (stored unit {@link RATIO}) and shown in percent. */
  percent: same('', '%'),
  /** Second moment of area of a beam section. */
  secondMoment: { metric: { unit: 'mm^4', label: 'mm⁴' }, imperial: { unit: 'in^4', label: 'in⁴' } },
  /** Elastic moduli: GPa / million psi. */
  modulus: { metric: { unit: 'GPa', label: 'GPa' }, imperial: { unit: 'Mpsi', label: 'Mpsi' } },
  jerk: { metric: { unit: 'm/s^3', label: 'm/s³' }, imperial: { unit: 'in/s^3', label: 'in/s³' } },
  /** Short times (shaper delays, ramps): ms. */
  timeShort: same('ms', 'ms'),
} as const satisfies Record<string, QuantityDef>;

/** Key of a quantity in {@link QUANTITIES}. */
export type QuantityKey = keyof typeof QUANTITIES;

/** Stored "unit" of a share kept as a fraction (0.6), shown as a percentage (60 %). */
export const RATIO = 'ratio';

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
  if (stored === RATIO) return quantity === 'percent' ? value * 100 : value;
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
  if (stored === RATIO) return quantity === 'percent' ? value / 100 : value;
  const source = QUANTITIES[quantity][system].unit;
  if (!source) return value;
  return convert(value, source, stored);
}
