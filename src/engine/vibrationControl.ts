import { requireNumber, throwInputError } from './errors';
import type { ModeId } from './structuralModes';

// Vibration-control numbers for the lowest mode (docs/models/vibration-control.md): the zero-vibration input
// shapers and the residual vibration a velocity ramp leaves behind.

/** One impulse of an input shaper: the command is convolved with these. */
export interface ShaperImpulse {
  /** Time of the impulse after the start of the command [s]. */
  timeS: number;
  /** Share of the command the impulse carries [-]; the shares add up to 1. */
  amplitude: number;
}

function dampedPeriodS(scope: string, args: { frequencyHz: number; dampingRatio?: number } | undefined): { td: number; k: number } {
  const f = requireNumber(scope, 'frequencyHz', args?.frequencyHz, 0, Infinity, true);
  const zeta = requireNumber(scope, 'dampingRatio', args?.dampingRatio ?? 0, 0, 0.99);
  const root = Math.sqrt(1 - zeta * zeta);
  // K = exp(−ζπ/√(1−ζ²)) is the decay of the mode over half a damped period.
  return { td: 1 / (f * root), k: Math.exp((-zeta * Math.PI) / root) };
}

/**
 * Impulses of the zero-vibration (ZV) shaper: two impulses half a damped period apart, sized so that the second
 * cancels the vibration the first starts. Undamped (ζ = 0): ½ at 0 and ½ at 1/(2f).
 * @param args.frequencyHz - natural frequency of the mode f [Hz]
 * @param args.dampingRatio - damping ratio ζ of the mode (default 0) [-]
 * @returns the two impulses
 * @see N. C. Singer & W. P. Seering, "Preshaping command inputs to reduce system vibration", ASME J. Dyn. Sys.,
 *   Meas., Control 112 (1990) 76–82 — impulse times 0, π/ω_d and amplitudes 1/(1+K), K/(1+K); docs/models/vibration-control.md
 */
export function zvShaperImpulses(args: { frequencyHz: number; dampingRatio?: number }): ShaperImpulse[] {
  const { td, k } = dampedPeriodS('zvShaperImpulses', args);
  return [
    { timeS: 0, amplitude: 1 / (1 + k) },
    { timeS: td / 2, amplitude: k / (1 + k) },
  ];
}

/**
 * Impulses of the zero-vibration-and-derivative (ZVD) shaper: three impulses half a damped period apart, which
 * also zero the derivative of the residual vibration with respect to frequency (robust to a wrong frequency).
 * Undamped: ¼, ½, ¼ at 0, 1/(2f), 1/f.
 * @param args.frequencyHz - natural frequency of the mode f [Hz]
 * @param args.dampingRatio - damping ratio ζ of the mode (default 0) [-]
 * @returns the three impulses
 * @see Singer & Seering (1990), as for {@link zvShaperImpulses}: amplitudes 1, 2K, K² over (1+K)²
 */
export function zvdShaperImpulses(args: { frequencyHz: number; dampingRatio?: number }): ShaperImpulse[] {
  const { td, k } = dampedPeriodS('zvdShaperImpulses', args);
  const d = (1 + k) * (1 + k);
  return [
    { timeS: 0, amplitude: 1 / d },
    { timeS: td / 2, amplitude: (2 * k) / d },
    { timeS: td, amplitude: (k * k) / d },
  ];
}

/**
 * Time the ZV shaper adds to every move: half a damped period, 1/(2·f·√(1−ζ²)).
 * @param args.frequencyHz - natural frequency of the mode f [Hz]
 * @param args.dampingRatio - damping ratio ζ (default 0) [-]
 * @returns added move time [s]
 * @see Singer & Seering (1990); docs/models/vibration-control.md
 */
export function zvShaperDurationS(args: { frequencyHz: number; dampingRatio?: number }): number {
  return dampedPeriodS('zvShaperDurationS', args).td / 2;
}

/**
 * Time the ZVD shaper adds to every move: one damped period, 1/(f·√(1−ζ²)).
 * @param args.frequencyHz - natural frequency of the mode f [Hz]
 * @param args.dampingRatio - damping ratio ζ (default 0) [-]
 * @returns added move time [s]
 * @see Singer & Seering (1990); docs/models/vibration-control.md
 */
export function zvdShaperDurationS(args: { frequencyHz: number; dampingRatio?: number }): number {
  return dampedPeriodS('zvdShaperDurationS', args).td;
}

function sinc(x: number): number {
  return Math.abs(x) < 1e-8 ? 1 : Math.sin(x) / x;
}

/**
 * Residual vibration an undamped mode keeps after a velocity ramp from rest to a speed v in time T. The command
 * acceleration a(t) excites the mode's relative coordinate x'' + ω²x = −a(t); once the ramp is over the mode
 * swings with amplitude |∫a(t)·e^(−iωt) dt|/ω. An acceleration that rises in a time T_j, holds, and falls in T_j
 * is a rectangle of width T − T_j convolved with one of width T_j, so the integral is
 * v·sinc(ω(T − T_j)/2)·sinc(ωT_j/2): T_j = 0 is the constant-acceleration (trapezoidal-velocity) ramp and
 * T_j = T/2 the pure jerk-limited S-ramp, v·sinc²(ωT/4).
 * @param args.frequencyHz - natural frequency of the mode f [Hz]
 * @param args.speedMPerS - speed change of the ramp v [m/s]
 * @param args.rampTimeS - duration of the ramp T [s]
 * @param args.jerkTimeS - time the acceleration takes to rise (and to fall) T_j, 0 … T/2 (default 0) [s]
 * @returns residual amplitude [mm]
 * @see docs/models/vibration-control.md (Fourier transform of the acceleration pulse; undamped single mode)
 */
export function rampResidualVibrationMm(args: { frequencyHz: number; speedMPerS: number; rampTimeS: number; jerkTimeS?: number }): number {
  const s = 'rampResidualVibrationMm';
  const f = requireNumber(s, 'frequencyHz', args?.frequencyHz, 0, Infinity, true);
  const v = Math.abs(requireNumber(s, 'speedMPerS', args?.speedMPerS));
  const t = requireNumber(s, 'rampTimeS', args?.rampTimeS, 0);
  const tj = requireNumber(s, 'jerkTimeS', args?.jerkTimeS ?? 0, 0);
  if (tj > t / 2 + 1e-12) throwInputError(s, `must be at most half the ramp time (${t / 2} s), got ${tj}`, 'jerkTimeS');
  const w = 2 * Math.PI * f;
  return (v / w) * Math.abs(sinc((w * (t - tj)) / 2) * sinc((w * tj) / 2)) * 1000;
}

/**
 * Shortest ramp time from which on the residual vibration stays within a tolerance whatever the exact frequency
 * (the upper envelope of the sinc terms, |sinc x| ≤ min(1, 1/|x|)): trapezoidal T = 2v/(ω²·tol),
 * pure S-ramp T = 4·√(v/(ω³·tol)); 0 when even an abrupt speed step stays within it (v/ω ≤ tol).
 * @param args.frequencyHz - natural frequency of the mode f [Hz]
 * @param args.speedMPerS - speed change of the ramp v [m/s]
 * @param args.toleranceMm - allowed residual amplitude [mm]
 * @returns shortest ramp time for each ramp shape [s]
 * @see docs/models/vibration-control.md
 */
export function rampTimeForToleranceS(args: { frequencyHz: number; speedMPerS: number; toleranceMm: number }): {
  trapezoidalS: number;
  jerkLimitedS: number;
} {
  const s = 'rampTimeForToleranceS';
  const f = requireNumber(s, 'frequencyHz', args?.frequencyHz, 0, Infinity, true);
  const v = Math.abs(requireNumber(s, 'speedMPerS', args?.speedMPerS));
  const tol = requireNumber(s, 'toleranceMm', args?.toleranceMm, 0, Infinity, true) / 1000;
  const w = 2 * Math.PI * f;
  if (v / w <= tol) return { trapezoidalS: 0, jerkLimitedS: 0 };
  return { trapezoidalS: (2 * v) / (w * w * tol), jerkLimitedS: 4 * Math.sqrt(v / (w * w * w * tol)) };
}

/** Vibration-control section of the result (docs/models/vibration-control.md). */
export interface ShapingResult {
  /** Frequency the shapers are tuned to: the lowest mode [Hz]. */
  frequencyHz: number;
  /** Mode it comes from (modes[].id). */
  modeId: ModeId;
  /** Move time the ZV and ZVD shapers add [s]. */
  zvDurationS: number;
  zvdDurationS: number;
  /** Speed change of the ramps below: the cruise speed [m/s]. */
  rampSpeedMPerS: number;
  /** Residual vibration the design's tolerance allows [mm]. */
  toleranceMm: number;
  /** Shortest ramp from rest to cruise that keeps the residual vibration within the tolerance [s]. */
  rampTimeForTolerance: { trapezoidalS: number; jerkLimitedS: number };
  /** Residual amplitude over ramp time, both ramp shapes [s, mm]. */
  residual: { rampTimeS: number[]; trapezoidalMm: number[]; jerkLimitedMm: number[] };
  /** What stiffness buys: the shortest ramp for the tolerance at other lowest-mode frequencies [Hz, s]. */
  byFrequency: { frequencyHz: number[]; trapezoidalS: number[]; jerkLimitedS: number[] };
}

/** Ramp times sampled for the residual plot: at least this many periods of the mode… */
const RESIDUAL_PERIODS = 6;
/** …and at most this many (the samples must still resolve every lobe). */
const MAX_RESIDUAL_PERIODS = 40;
const RESIDUAL_SAMPLES = 401;
/** Frequencies sampled for the "what stiffness buys" plot, as multiples of the lowest mode. */
const FREQUENCY_FACTORS = [0.5, 0.625, 0.75, 0.875, 1, 1.25, 1.5, 1.75, 2, 2.5, 3];

/**
 * The vibration-control section: ZV/ZVD shaper durations for the lowest mode, the residual vibration of a
 * trapezoidal and of a pure jerk-limited ramp from rest to cruise over ramp time, and the shortest ramp for the
 * tolerance at the design's frequency and at multiples of it.
 * @param args.frequencyHz - lowest natural frequency [Hz]
 * @param args.modeId - which mode it is
 * @param args.speedMPerS - cruise speed [m/s]
 * @param args.toleranceMm - allowed residual vibration [mm]
 * @returns the section
 * @see docs/models/vibration-control.md
 */
export function vibrationControl(args: { frequencyHz: number; modeId: ModeId; speedMPerS: number; toleranceMm: number }): ShapingResult {
  const f = requireNumber('vibrationControl', 'frequencyHz', args?.frequencyHz, 0, Infinity, true);
  const v = args.speedMPerS;
  const period = 1 / f;
  const forTolerance = rampTimeForToleranceS({ frequencyHz: f, speedMPerS: v, toleranceMm: args.toleranceMm });
  // The plot reaches past the shortest safe ramp, so the designer sees where the curves settle under the tolerance.
  const span = Math.min(MAX_RESIDUAL_PERIODS * period, Math.max(RESIDUAL_PERIODS * period, 1.25 * forTolerance.trapezoidalS));
  const rampTimeS: number[] = [];
  const trapezoidalMm: number[] = [];
  const jerkLimitedMm: number[] = [];
  // The closed forms of rampResidualVibrationMm, inline: v/ω·|sinc(ωT/2)| and v/ω·sinc²(ωT/4) [mm].
  const w = 2 * Math.PI * f;
  const amp = (Math.abs(v) / w) * 1000;
  for (let i = 0; i < RESIDUAL_SAMPLES; i++) {
    const t = (span * i) / (RESIDUAL_SAMPLES - 1);
    rampTimeS.push(t);
    trapezoidalMm.push(amp * Math.abs(sinc((w * t) / 2)));
    const q = sinc((w * t) / 4);
    jerkLimitedMm.push(amp * q * q);
  }
  const byFrequency = { frequencyHz: [] as number[], trapezoidalS: [] as number[], jerkLimitedS: [] as number[] };
  for (const factor of FREQUENCY_FACTORS) {
    const r = rampTimeForToleranceS({ frequencyHz: f * factor, speedMPerS: v, toleranceMm: args.toleranceMm });
    byFrequency.frequencyHz.push(f * factor);
    byFrequency.trapezoidalS.push(r.trapezoidalS);
    byFrequency.jerkLimitedS.push(r.jerkLimitedS);
  }
  return {
    frequencyHz: f,
    modeId: args.modeId,
    zvDurationS: zvShaperDurationS({ frequencyHz: f }),
    zvdDurationS: zvdShaperDurationS({ frequencyHz: f }),
    rampSpeedMPerS: v,
    toleranceMm: args.toleranceMm,
    rampTimeForTolerance: forTolerance,
    residual: { rampTimeS, trapezoidalMm, jerkLimitedMm },
    byFrequency,
  };
}
