import type { BeltPart, MotorPart, PulleyPart } from '@/api/parts';
import { getAt } from '@/engine';

/** The parts of the shelf the Design desk offers. */
export interface Shelf {
  belts: BeltPart[];
  pulleys: PulleyPart[];
  motors: MotorPart[];
}

const BELT_KEYS = ['pitchMm', 'widthMm', 'linearMassKgPerM', 'axialStiffnessN', 'allowableTensionN', 'minPulleyTeeth'] as const;
const MOTOR_KEYS = [
  'stepAngleDeg',
  'holdingTorqueNm',
  'ratedCurrentA',
  'phaseResistanceOhm',
  'phaseInductanceMh',
  'rotorInertiaKgM2',
  'massKg',
] as const;

const close = (a: unknown, b: unknown): boolean =>
  typeof a === 'number' && typeof b === 'number' && Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));

/**
 * Design values a belt from the shelf fills in.
 * @param part - the belt
 * @returns dotted path → stored value
 */
export function beltValues(part: BeltPart): Record<string, unknown> {
  return Object.fromEntries(BELT_KEYS.map((k) => [`belt.${k}`, part[k]]));
}

/**
 * Design values a motor from the shelf fills in (its torque table too, or the model when it has none).
 * @param part - the motor
 */
export function motorValues(part: MotorPart): Record<string, unknown> {
  const values: Record<string, unknown> = Object.fromEntries(MOTOR_KEYS.map((k) => [`motor.${k}`, part[k]]));
  const hasTable = !!part.torqueCurve && part.torqueCurve.length >= 2;
  values['motor.torqueCurve'] = hasTable ? structuredClone(part.torqueCurve) : null;
  // The table says which drive it describes; the engine warns when the design's driver differs.
  values['motor.torqueCurveConditions'] = hasTable && part.torqueCurveConditions ? { ...part.torqueCurveConditions } : null;
  return values;
}

/**
 * Design values a pulley fills in, as drive pulley or as idler.
 * @param part - the pulley
 * @param role - where it goes
 */
export function pulleyValues(part: PulleyPart, role: 'drive' | 'idler'): Record<string, unknown> {
  // A known inertia replaces the estimate; a part without one goes back to the estimate.
  return role === 'drive'
    ? { 'pulley.driveTeeth': part.teeth, 'pulley.driveInertiaKgM2': part.inertiaKgM2 ?? null }
    : { 'pulley.idlerTeeth': part.teeth, 'pulley.idlerInertiaKgM2': part.inertiaKgM2 ?? null };
}

/**
 * Whether a shelf pulley may serve in a role: drive pulleys on motors, idlers (toothed or smooth) elsewhere.
 * @param part - the pulley
 * @param role - drive or idler
 */
export function fitsRole(part: PulleyPart, role: 'drive' | 'idler'): boolean {
  return role === 'drive' ? part.kind === 'drive' : part.kind !== 'drive';
}

/** The shelf belt whose numbers the design carries, if any. */
export function matchingBelt(model: unknown, belts: BeltPart[]): BeltPart | null {
  return belts.find((b) => BELT_KEYS.every((k) => close(getAt(model, `belt.${k}`), b[k]))) ?? null;
}

/** The shelf motor whose numbers the design carries, if any. */
export function matchingMotor(model: unknown, motors: MotorPart[]): MotorPart | null {
  return motors.find((m) => MOTOR_KEYS.every((k) => close(getAt(model, `motor.${k}`), m[k]))) ?? null;
}

/** Shelf pulleys with the design's teeth and belt pitch in a role. */
export function matchingPulley(model: unknown, pulleys: PulleyPart[], role: 'drive' | 'idler'): PulleyPart | null {
  const teeth = getAt(model, role === 'drive' ? 'pulley.driveTeeth' : 'pulley.idlerTeeth');
  const pitch = getAt(model, 'belt.pitchMm');
  return pulleys.find((p) => fitsRole(p, role) && p.teeth === teeth && close(p.pitchMm, pitch)) ?? null;
}
