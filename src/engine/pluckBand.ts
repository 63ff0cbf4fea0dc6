/**
 * Share by which a span's tension may differ from its target and still count as set correctly [-].
 * Typical value: belt makers' installation guides commonly allow about ±10 % on the set tension (a value from
 * memory, not a table of a named standard).
 */
export const PLUCK_TENSION_TOLERANCE = 0.1;

/**
 * The band of pluck frequencies that keeps a span's tension within ±`tolerance` of its target. By the string law
 * f = (1/2L)·√(T/μ) the frequency goes with the square root of tension, so ±10 % on tension is about −5.1 % / +4.9 %
 * on frequency: f·√(1 − t) … f·√(1 + t).
 * @param args.targetHz - target pluck frequency at the design tension [Hz]
 * @param args.tolerance - allowed share of tension either side (default {@link PLUCK_TENSION_TOLERANCE}) [-]
 * @returns the lowest and highest frequency that count as on target [Hz]
 * @see Mersenne's laws of a vibrating string, e.g. Halliday, Resnick & Walker, Fundamentals of Physics, ch. 16
 */
export function pluckBandHz(args: { targetHz: number; tolerance?: number }): { lowHz: number; highHz: number } {
  const t = args.tolerance ?? PLUCK_TENSION_TOLERANCE;
  return { lowHz: args.targetHz * Math.sqrt(1 - t), highHz: args.targetHz * Math.sqrt(1 + t) };
}
