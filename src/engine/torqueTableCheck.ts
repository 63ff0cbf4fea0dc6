import type { Check, DriverSpec, MotorSpec } from './types';

/**
 * Share by which the design's supply voltage or driver current may differ from the torque table's before the check
 * warns (our judgement: 5 % is about the scatter of one motor's measured curves; beyond it the table describes
 * another drive, since torque at speed follows the supply and torque at rest the current).
 */
export const TORQUE_TABLE_CONDITION_TOLERANCE = 0.05;

/**
 * Whether the motor's torque table was measured at the supply and current this design drives it with. A table
 * replaces the motor model, so a table measured at 36 V says nothing reliable about a 24 V drive. No check when the
 * design uses the model; a warning when the table's conditions are not recorded or differ.
 * @param motor - the design's motor (torque table and its conditions)
 * @param driver - the design's driver (supply [V], RMS current [A])
 * @returns the check, or null when no torque table is used
 */
export function torqueTableCheck(motor: MotorSpec, driver: DriverSpec): Check | null {
  if (!motor.torqueCurve || motor.torqueCurve.length === 0) return null;
  const base = { id: 'torque-table-conditions', kind: 'voltageV' as const, subject: 'Motor torque table', unit: 'V' };
  const at = motor.torqueCurveConditions ?? null;
  if (!at) {
    const parts = [
      'The motor’s torque table does not record the supply and driver current it was measured at; check that they match this design’s ',
      { value: driver.supplyV, kind: 'voltageV' as const },
      ' and ',
      { value: driver.currentRmsA, kind: 'currentA' as const },
      ', or the limits may be off.',
    ];
    return { ...base, severity: 'warn', message: render(parts), parts, value: driver.supplyV, limit: null };
  }
  const off = (a: number, b: number) => Math.abs(a - b) > TORQUE_TABLE_CONDITION_TOLERANCE * b;
  const differs = off(driver.supplyV, at.supplyV) || off(driver.currentRmsA, at.currentRmsA);
  const parts = differs
    ? [
        'The motor’s torque table was measured at ',
        { value: at.supplyV, kind: 'voltageV' as const },
        ' and ',
        { value: at.currentRmsA, kind: 'currentA' as const },
        '; this design drives it at ',
        { value: driver.supplyV, kind: 'voltageV' as const },
        ' and ',
        { value: driver.currentRmsA, kind: 'currentA' as const },
        ', so the table does not describe this drive. Measure a table at these settings, or clear it to use the motor model.',
      ]
    : [
        'The motor’s torque table was measured at ',
        { value: at.supplyV, kind: 'voltageV' as const },
        ' and ',
        { value: at.currentRmsA, kind: 'currentA' as const },
        ', the supply and current of this design.',
      ];
  return { ...base, severity: differs ? 'warn' : 'ok', message: render(parts), parts, value: driver.supplyV, limit: at.supplyV };
}

/** The message in metric words (the `parts` carry the numbers for other unit systems). */
function render(parts: (string | { value: number; kind: 'voltageV' | 'currentA' })[]): string {
  return parts.map((p) => (typeof p === 'string' ? p : `${Number(p.value.toPrecision(3))} ${p.kind === 'voltageV' ? 'V' : 'A'}`)).join('');
}
