import { requireNumber } from './errors';

/**
 * Natural frequency of an undamped spring–mass system: f = (1/2π)·√(k/m).
 * @param args.stiffnessNPerM - spring stiffness k [N/m]
 * @param args.massKg - mass m [kg]
 * @returns natural frequency [Hz]
 * @see S. S. Rao, Mechanical Vibrations, 5th ed., ch. 2, free vibration of undamped SDOF systems (from memory)
 */
export function naturalFrequencyHz(args: { stiffnessNPerM: number; massKg: number }): number {
  const k = requireNumber('naturalFrequencyHz', 'stiffnessNPerM', args?.stiffnessNPerM, 0);
  const m = requireNumber('naturalFrequencyHz', 'massKg', args?.massKg, 0, Infinity, true);
  return Math.sqrt(k / m) / (2 * Math.PI);
}

/**
 * Axial stiffness of a belt span as a bar spring: k = EA/L.
 * @param args.axialStiffnessN - EA of the belt, force per unit strain [N]
 * @param args.spanMm - span length L [mm]
 * @returns span stiffness [N/m]
 * @see S. S. Rao, Mechanical Vibrations, 5th ed., ch. 1, spring elements (from memory)
 */
export function spanStiffnessNPerM(args: { axialStiffnessN: number; spanMm: number }): number {
  const ea = requireNumber('spanStiffnessNPerM', 'axialStiffnessN', args?.axialStiffnessN, 0);
  const l = requireNumber('spanStiffnessNPerM', 'spanMm', args?.spanMm, 0, Infinity, true) / 1000;
  return ea / l;
}

/**
 * Overshoot of an undamped spring–mass system after a step change of acceleration a: the mass settles
 * a/ω² away from its unloaded position and overshoots by the same amount, x = a/(2π·f)².
 * @param args.accelMPerS2 - step of acceleration a [m/s²]
 * @param args.frequencyHz - natural frequency f [Hz]
 * @returns overshoot amplitude [mm]
 * @see S. S. Rao, Mechanical Vibrations, 5th ed., ch. 4, response to a step input (from memory)
 */
export function ringingAmplitudeMm(args: { accelMPerS2: number; frequencyHz: number }): number {
  const a = Math.abs(requireNumber('ringingAmplitudeMm', 'accelMPerS2', args?.accelMPerS2));
  const f = requireNumber('ringingAmplitudeMm', 'frequencyHz', args?.frequencyHz, 0, Infinity, true);
  const w = 2 * Math.PI * f;
  return (a / (w * w)) * 1000;
}
