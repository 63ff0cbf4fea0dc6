/** The two unit systems a person can pick. */
export type UnitSystem = 'metric' | 'imperial';

/** Every unit system, in the order the toggle shows them. */
export const UNIT_SYSTEMS: readonly UnitSystem[] = ['metric', 'imperial'];

/**
 * Whether a value names a unit system (for reading a saved preference).
 * @param value - anything read from storage or a request
 */
export function isUnitSystem(value: unknown): value is UnitSystem {
  return value === 'metric' || value === 'imperial';
}
