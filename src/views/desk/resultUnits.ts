import type { QuantityKey } from '@/format';

/** How to show a number that carries an engine unit string (checks report "N", "mm", "m/s²" …). */
export interface EngineUnit {
  quantity: QuantityKey;
  /** mathjs unit string of the engine's value. */
  stored: string;
}

const ENGINE_UNITS: Record<string, EngineUnit> = {
  mm: { quantity: 'length', stored: 'mm' },
  N: { quantity: 'force', stored: 'N' },
  'N·m': { quantity: 'torque', stored: 'N m' },
  'm/s²': { quantity: 'accel', stored: 'm/s^2' },
  'm/s': { quantity: 'speed', stored: 'm/s' },
  kg: { quantity: 'mass', stored: 'kg' },
  Hz: { quantity: 'frequency', stored: 'Hz' },
  A: { quantity: 'current', stored: 'A' },
  V: { quantity: 'voltage', stored: 'V' },
  teeth: { quantity: 'teeth', stored: '' },
  '°': { quantity: 'angle', stored: '' },
  '': { quantity: 'count', stored: '' },
};

/**
 * The display quantity of an engine unit string; unknown units are shown as they are.
 * @param unit - unit string from the engine ("N", "m/s²", …)
 */
export function engineUnit(unit: string): EngineUnit | null {
  return ENGINE_UNITS[unit] ?? null;
}
