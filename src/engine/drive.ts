import { requireNumber } from './errors';

/**
 * Pitch diameter of a toothed pulley: the pitch circle carries z pitches, so d = z·p/π.
 * @param args.teeth - pulley tooth count z [-]
 * @param args.pitchMm - belt pitch p [mm]
 * @returns pitch diameter [mm]
 * @see ISO 5294 / ISO 13050 pulley tables (pitch circle on the belt's tension member; geometric identity)
 */
export function pitchDiameterMm(args: { teeth: number; pitchMm: number }): number {
  const teeth = requireNumber('pitchDiameterMm', 'teeth', args?.teeth, 0, 10000, true);
  const pitchMm = requireNumber('pitchDiameterMm', 'pitchMm', args?.pitchMm, 0, 1000, true);
  return (teeth * pitchMm) / Math.PI;
}

/**
 * Belt travel per motor revolution: one turn feeds z pitches of belt.
 * @param args.teeth - drive pulley tooth count z [-]
 * @param args.pitchMm - belt pitch p [mm]
 * @returns belt travel per revolution [mm]
 */
export function travelPerRevMm(args: { teeth: number; pitchMm: number }): number {
  const teeth = requireNumber('travelPerRevMm', 'teeth', args?.teeth, 0, 10000, true);
  const pitchMm = requireNumber('travelPerRevMm', 'pitchMm', args?.pitchMm, 0, 1000, true);
  return teeth * pitchMm;
}

/**
 * Microsteps per millimetre of belt at one motor pulley.
 * @param args.fullStepsPerRev - full steps per motor revolution (200 for a 1.8° motor) [-]
 * @param args.microsteps - driver microstep setting [-]
 * @param args.teeth - drive pulley tooth count [-]
 * @param args.pitchMm - belt pitch [mm]
 * @returns steps per mm of belt [1/mm]
 * @see common practice: 200 × 16 / (20 × 2 mm) = 80 steps/mm (public printer-firmware discussion)
 */
export function stepsPerMm(args: { fullStepsPerRev: number; microsteps: number; teeth: number; pitchMm: number }): number {
  const s = 'stepsPerMm';
  const full = requireNumber(s, 'fullStepsPerRev', args?.fullStepsPerRev, 0, 1e6, true);
  const micro = requireNumber(s, 'microsteps', args?.microsteps, 0, 1e6, true);
  const teeth = requireNumber(s, 'teeth', args?.teeth, 0, 10000, true);
  const pitchMm = requireNumber(s, 'pitchMm', args?.pitchMm, 0, 1000, true);
  return (full * micro) / (teeth * pitchMm);
}

/**
 * Rotor (and pulley) inertia seen as a mass on the belt line: equal kinetic energy ½Jω² = ½m·v², v = ω·r,
 * so m_eq = J/r² with r = z·p/(2π).
 * @param args.inertiaKgM2 - rotational inertia J [kg·m²]
 * @param args.teeth - pulley tooth count z [-]
 * @param args.pitchMm - belt pitch p [mm]
 * @returns equivalent linear mass [kg]
 * @see Linear Motion Tips, "How to account for belt and pulley inertia during system design" (J = m·r²)
 */
export function reflectedMassKg(args: { inertiaKgM2: number; teeth: number; pitchMm: number }): number {
  const s = 'reflectedMassKg';
  const j = requireNumber(s, 'inertiaKgM2', args?.inertiaKgM2, 0, 1);
  const teeth = requireNumber(s, 'teeth', args?.teeth, 0, 10000, true);
  const pitchMm = requireNumber(s, 'pitchMm', args?.pitchMm, 0, 1000, true);
  const rM = (teeth * pitchMm) / (2 * Math.PI) / 1000;
  return j / (rM * rM);
}

/**
 * Full steps per revolution from the step angle.
 * @param stepAngleDeg - full-step angle [°] (1.8 or 0.9 for usual hybrids)
 * @returns full steps per revolution [-]
 */
export function fullStepsPerRev(stepAngleDeg: number): number {
  return 360 / requireNumber('fullStepsPerRev', 'stepAngleDeg', stepAngleDeg, 0, 90, true);
}

/**
 * Rotor tooth count of a two-phase hybrid stepper: N_r = 90°/step angle (1.8° → 50).
 * @param stepAngleDeg - full-step angle [°]
 * @returns rotor teeth N_r [-]
 * @see motor manufacturer FAQ: 50 rotor teeth · 4 = 200 steps for a 1.8° two-phase hybrid
 */
export function rotorTeeth(stepAngleDeg: number): number {
  return 90 / requireNumber('rotorTeeth', 'stepAngleDeg', stepAngleDeg, 0, 90, true);
}
