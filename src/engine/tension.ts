import { requireNumber } from './errors';

/**
 * Fundamental transverse (pluck) frequency of a belt span: f = (1/(2L))·√(T/μ).
 * @param args.tensionN - static span tension T [N]
 * @param args.linearMassKgPerM - belt mass per metre μ [kg/m]
 * @param args.spanMm - free span length L between its supports [mm]
 * @returns fundamental frequency [Hz]
 * @see Halliday, Resnick & Walker, Fundamentals of Physics, ch. 16 (v = √(τ/μ), f = v/(2L)); Mersenne's laws
 */
export function spanFrequencyHz(args: { tensionN: number; linearMassKgPerM: number; spanMm: number }): number {
  const s = 'spanFrequencyHz';
  const t = requireNumber(s, 'tensionN', args?.tensionN, 0);
  const mu = requireNumber(s, 'linearMassKgPerM', args?.linearMassKgPerM, 0, Infinity, true);
  const l = requireNumber(s, 'spanMm', args?.spanMm, 0, Infinity, true) / 1000;
  return Math.sqrt(t / mu) / (2 * l);
}

/**
 * Span tension from a measured pluck frequency, the inverse of {@link spanFrequencyHz}: T = 4·μ·L²·f².
 * @param args.frequencyHz - measured fundamental frequency f [Hz]
 * @param args.linearMassKgPerM - belt mass per metre μ [kg/m]
 * @param args.spanMm - free span length L [mm]
 * @returns span tension [N]
 * @see Halliday, Resnick & Walker, Fundamentals of Physics, ch. 16 (string resonance)
 */
export function tensionFromFrequencyN(args: { frequencyHz: number; linearMassKgPerM: number; spanMm: number }): number {
  const s = 'tensionFromFrequencyN';
  const f = requireNumber(s, 'frequencyHz', args?.frequencyHz, 0);
  const mu = requireNumber(s, 'linearMassKgPerM', args?.linearMassKgPerM, 0, Infinity, true);
  const l = requireNumber(s, 'spanMm', args?.spanMm, 0, Infinity, true) / 1000;
  return 4 * mu * l * l * f * f;
}
