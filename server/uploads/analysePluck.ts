import { decodeWav } from './decodeWav';
import { fftInPlace, nextPowerOfTwo } from './fft';
import { PluckError } from './pluckError';

/** Band in which the fundamental is looked for. */
export interface AnalysePluckOptions {
  /** Lowest fundamental accepted [Hz] (default 20). */
  minHz?: number;
  /** Highest fundamental accepted [Hz] (default 1000). */
  maxHz?: number;
}

/** What a pluck recording says about the span. */
export interface PluckAnalysis {
  /** Fundamental frequency of the plucked span [Hz]. */
  frequencyHz: number;
  /** 0..1: how clearly the tone stands out of the noise and how well its overtones line up. */
  confidence: number;
  /** Sample rate of the file [Hz]. */
  sampleRateHz: number;
  /** Channels in the file (stereo is mixed down). */
  channels: number;
  /** Length of the recording [s]. */
  durationS: number;
  /**
   * Spectrum of the analysed stretch (after steady mains hum was subtracted) for plotting: 0 to 2 × maxHz, at
   * most 512 points, each the highest bin of its band; magnitude in dB relative to a full-scale sine (dBFS).
   */
  spectrum: { frequencyHz: number[]; magnitudeDb: number[] };
  /** Measured frequencies of the overtones found at integer multiples of the fundamental (2nd and up) [Hz]. */
  harmonicsHz: number[];
}

/** Default band for the fundamental [Hz]; belts on small machines ring at roughly 40–200 Hz (from memory). */
export const PLUCK_DEFAULT_MIN_HZ = 20;
export const PLUCK_DEFAULT_MAX_HZ = 1000;

// --- tuning constants (each explained where used) ---------------------------------------------------------
const MIN_DURATION_S = 0.5;
const WINDOW_MIN_S = 0.5;
const WINDOW_MAX_S = 1.0;
/** Onset: first block whose energy over the background reaches 10 % of the peak's. */
const ONSET_FRACTION = 0.1;
/** End of the ring: energy over the background down to 0.1 % (−30 dB) of the peak's. */
const DECAYED_FRACTION = 0.001;
const BLOCK_S = 0.01;
const SILENCE_DBFS = -80;
const ZERO_PAD_FACTOR = 8;
const PEAK_MIN_DB = 12;
const FLOOR_SAMPLES = 256;
/** A peak within ±6/T of one 25 dB stronger is taken for a side lobe of it. */
const SIDE_LOBE_RATIO = 10 ** (25 / 10);
const TONE_MIN_DB = 20;
const STRONG_FUNDAMENTAL_DB = 25;
const CONFIDENT_DB = 50;
const HARMONIC_TOLERANCE = 0.01;
const MISSING_HARMONIC_DB = 6;
const MAX_HARMONICS = 12;
const HUM_BASES_HZ = [50, 60] as const;
const HUM_TOLERANCE_HZ = 1;
const HUM_SEGMENT_MAX_S = 0.5;
const HUM_SEGMENT_MIN_S = 0.25;
const HUM_MIN_SEGMENTS = 3;
const HUM_MAX_SPREAD = 1.5;
const HUM_FIT_MIN_QUIET_S = 0.5;
const HUM_FIT_MIN_PIECE_S = 0.25;
const HUM_FIT_MAX_SPECTRUM_S = 4;
const HUM_FIT_SEARCH_STEP_HZ = 0.01;
const HUM_FIT_SEARCH_STEPS = 10;
const SPECTRUM_POINTS = 512;

const NO_TONE = 'No clear tone found — pluck closer to the microphone.';

interface Peak {
  /** Interpolated frequency [Hz]. */
  frequencyHz: number;
  /** Power at the peak bin (linear). */
  power: number;
  /** Height above the local noise floor [dB]. */
  salienceDb: number;
}

interface Candidate {
  peak: Peak;
  score: number;
  /** Matched peaks, index = harmonic number − 1 (undefined when absent). */
  harmonics: (Peak | undefined)[];
}

/**
 * Finds the fundamental frequency of a plucked belt span in a WAV recording.
 *
 * Steps: decode and mix down; remove DC; low-pass and decimate to ~8–16 kHz; find the pluck's onset and
 * ring from 10 ms block energies and analyse from the onset for 0.5–1 s (the pluck decays, so that is the
 * loudest stretch); subtract steady mains lines fitted in the file's quiet part; Hann window, zero-pad ×8,
 * radix-2 FFT; peaks above the local noise floor, located by parabolic (quadratic) interpolation on the dB
 * spectrum for sub-bin accuracy; set aside what is left of mains hum (peaks within ±1 Hz of 50·k or 60·k Hz
 * that stay steady over the whole file — a decaying pluck at the same frequency is kept); score each
 * candidate in the band by the salience of its harmonic series (harmonic sum with a penalty for gaps), so a
 * recording whose 2nd harmonic is louder than its fundamental still returns the fundamental.
 *
 * @param bytes - the WAV file (PCM 8/16/24/32-bit integer or 32-bit float, mono or stereo, 8–96 kHz, ≤ 10 s)
 * @param opts - band for the fundamental [Hz], default 20–1000 Hz; a maxHz beyond what the (decimated) recording
 *   resolves is lowered to that limit
 * @returns the fundamental, a confidence 0..1, file facts, a ≤ 512-point spectrum and the overtones found
 * @throws PluckError 'unsupported_format' | 'too_long' | 'corrupt' | 'no_tone' with a message for the maker
 * @throws RangeError when `opts` is not a valid band (a programming error, not a user one)
 */
export function analysePluck(bytes: Buffer | Uint8Array, opts: AnalysePluckOptions = {}): PluckAnalysis {
  const minHz = opts.minHz ?? PLUCK_DEFAULT_MIN_HZ;
  let maxHz = opts.maxHz ?? PLUCK_DEFAULT_MAX_HZ;
  if (!Number.isFinite(minHz) || !Number.isFinite(maxHz) || minHz <= 0 || maxHz <= minHz) {
    throw new RangeError(`[analysePluck] invalid band ${minHz}–${maxHz} Hz`);
  }

  const wav = decodeWav(bytes);
  if (wav.durationS < MIN_DURATION_S) {
    throw new PluckError(
      'no_tone',
      `The recording is only ${wav.durationS.toFixed(2)} s long — record at least half a second after the pluck.`,
    );
  }

  // Decimate: belts ring below ~1 kHz, so ~8 kHz keeps several overtones and makes every step cheap.
  const factor = Math.max(1, Math.floor(wav.sampleRateHz / Math.max(8000, 8 * maxHz)));
  const rateHz = wav.sampleRateHz / factor;
  const rawSignal = decimate(removeDc(wav.samples), factor);
  // Above this the anti-alias filter starts to bite (or, undecimated, Nyquist is near).
  const topHz = factor === 1 ? 0.45 * rateHz : 0.3 * rateHz;
  if (maxHz > topHz) maxHz = topHz;
  if (maxHz <= minHz) throw new RangeError(`[analysePluck] band ${minHz}–${maxHz} Hz is above this recording's range`);

  if (maxBlockRmsDbfs(rawSignal, rateHz) < SILENCE_DBFS) {
    throw new PluckError('no_tone', 'The recording is silent — check the microphone and pluck closer to it.');
  }

  const ring = pluckWindow(rawSignal, rateHz);
  const { signal, lines: cancelledHum } = cancelMainsHum(rawSignal, rateHz, ring, topHz);
  const { start, length } = ring;
  const segment = signal.subarray(start, start + length);
  const windowS = length / rateHz;
  const spec = powerSpectrum(segment, rateHz);

  const lowHz = minHz * 0.97;
  const allPeaks = findPeaks(spec, lowHz, topHz, windowS);

  const humPeaks = new Set<Peak>();
  for (const peak of allPeaks) {
    // Judged on the recording as it came (before the hum was subtracted): is the line there all the time?
    if (isNearMains(peak.frequencyHz) && isSteadyOverFile(rawSignal, rateHz, peak.frequencyHz)) humPeaks.add(peak);
  }
  const peaks = allPeaks.filter((p) => !humPeaks.has(p));

  const candidates = peaks
    .filter((p) => p.frequencyHz >= minHz && p.frequencyHz <= maxHz)
    .map((p) => scoreCandidate(p, peaks, topHz, windowS));
  const best = candidates.length > 0 ? candidates.reduce((a, b) => (b.score > a.score ? b : a)) : undefined;
  const matched = best ? best.harmonics.filter((p): p is Peak => p !== undefined) : [];
  // White noise tops out ~12–14 dB above the median of its own periodogram; a pluck stands well above that.
  const strongestDb = matched.length > 0 ? Math.max(...matched.map((p) => p.salienceDb)) : -Infinity;
  if (!best || strongestDb < TONE_MIN_DB) {
    const hum = [...allPeaks.filter((p) => humPeaks.has(p)), ...cancelledHum].filter((p) => p.salienceDb >= TONE_MIN_DB);
    if (hum.length > 0) {
      const loudest = hum.reduce((a, b) => (b.salienceDb > a.salienceDb ? b : a));
      throw new PluckError(
        'no_tone',
        `Only a steady mains hum near ${Math.round(loudest.frequencyHz)} Hz was found — ` + 'pluck the span closer to the microphone.',
      );
    }
    throw new PluckError('no_tone', NO_TONE);
  }

  // Confidence: prominence (20 dB → 0, 50 dB → 1) and the share of salient power the series explains.
  const prominence = clamp01((strongestDb - TONE_MIN_DB) / (CONFIDENT_DB - TONE_MIN_DB));
  const totalPower = peaks.reduce((sum, p) => sum + p.power, 0);
  const explained = matched.reduce((sum, p) => sum + p.power, 0) / totalPower;
  const confidence = round(clamp01(0.5 * prominence + 0.5 * explained), 2);

  return {
    frequencyHz: round(refineFundamental(best), 3),
    confidence,
    sampleRateHz: wav.sampleRateHz,
    channels: wav.channels,
    durationS: round(wav.durationS, 4),
    spectrum: plotSpectrum(spec, Math.min(topHz, 2 * maxHz)),
    harmonicsHz: best.harmonics
      .slice(1)
      .filter((p): p is Peak => p !== undefined)
      .map((p) => round(p.frequencyHz, 2)),
  };
}

// --- signal conditioning ---------------------------------------------------------------------------------

function removeDc(x: Float64Array): Float64Array {
  let mean = 0;
  for (let i = 0; i < x.length; i++) mean += x[i];
  mean /= x.length;
  const y = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) y[i] = x[i] - mean;
  return y;
}

/**
 * Low-pass (windowed sinc, Blackman, 32·factor+1 taps, cut-off at 0.4 × the new sample rate, i.e. 0.8 of its
 * Nyquist frequency; flat to ~0.3 × the new rate) then keep every factor-th sample. Only kept outputs are
 * computed.
 */
function decimate(x: Float64Array, factor: number): Float64Array {
  if (factor === 1) return x;
  const taps = 32 * factor + 1;
  const centre = (taps - 1) / 2;
  const cutoff = 0.4 / factor; // cycles per input sample
  const h = new Float64Array(taps);
  let sum = 0;
  for (let n = 0; n < taps; n++) {
    const t = n - centre;
    const sinc = t === 0 ? 2 * cutoff : Math.sin(2 * Math.PI * cutoff * t) / (Math.PI * t);
    const w = 0.42 - 0.5 * Math.cos((2 * Math.PI * n) / (taps - 1)) + 0.08 * Math.cos((4 * Math.PI * n) / (taps - 1));
    h[n] = sinc * w;
    sum += h[n];
  }
  for (let n = 0; n < taps; n++) h[n] /= sum;
  const out = new Float64Array(Math.floor(x.length / factor));
  for (let m = 0; m < out.length; m++) {
    const base = m * factor - centre;
    const from = Math.max(0, -base);
    const to = Math.min(taps, x.length - base);
    let acc = 0;
    for (let n = from; n < to; n++) acc += h[n] * x[base + n];
    out[m] = acc;
  }
  return out;
}

function blockEnergies(x: Float64Array, rateHz: number): { energies: Float64Array; blockLength: number } {
  const blockLength = Math.max(1, Math.round(BLOCK_S * rateHz));
  const count = Math.ceil(x.length / blockLength);
  const energies = new Float64Array(count);
  for (let b = 0; b < count; b++) {
    let e = 0;
    const end = Math.min(x.length, (b + 1) * blockLength);
    for (let i = b * blockLength; i < end; i++) e += x[i] * x[i];
    energies[b] = e;
  }
  return { energies, blockLength };
}

function maxBlockRmsDbfs(x: Float64Array, rateHz: number): number {
  const { energies, blockLength } = blockEnergies(x, rateHz);
  let max = 0;
  for (const e of energies) max = Math.max(max, e);
  const rms = Math.sqrt(max / blockLength);
  return rms > 0 ? 20 * Math.log10(rms) : -Infinity;
}

/**
 * The stretch to analyse: from the pluck's onset to where it has decayed by 30 dB over the background,
 * kept within 0.5–1 s (and the file). Starting at the onset puts the attack on the Hann window's zero:
 * an attack inside the window would smear the line into slowly falling skirts (a decaying sine switched on
 * abruptly has a Lorentzian spectrum) that raise the local noise floor.
 */
function pluckWindow(x: Float64Array, rateHz: number): PluckWindow {
  const { energies, blockLength } = blockEnergies(x, rateHz);
  let peak = 0;
  for (let b = 1; b < energies.length; b++) if (energies[b] > energies[peak]) peak = b;
  const background = quantile(energies, 0.2);
  const swing = energies[peak] - background;
  let onset = peak;
  while (onset > 0 && energies[onset - 1] - background >= ONSET_FRACTION * swing) onset--;
  let end = peak;
  while (end < energies.length - 1 && energies[end + 1] - background >= DECAYED_FRACTION * swing) end++;

  const minLength = Math.min(x.length, Math.round(WINDOW_MIN_S * rateHz));
  const maxLength = Math.min(x.length, Math.round(WINDOW_MAX_S * rateHz));
  const length = Math.min(maxLength, Math.max(minLength, (end + 1 - onset) * blockLength));
  const start = Math.max(0, Math.min(onset * blockLength, x.length - length));
  return { start, length, ringStart: onset * blockLength, ringEnd: Math.min(x.length, (end + 1) * blockLength) };
}

interface PluckWindow {
  /** First sample of the analysed stretch. */
  start: number;
  /** Samples in the analysed stretch. */
  length: number;
  /** The pluck rings over [ringStart, ringEnd); the rest of the file is its quiet part. */
  ringStart: number;
  ringEnd: number;
}

function quantile(values: Float64Array, q: number): number {
  const sorted = values.slice().sort();
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

// --- spectrum -------------------------------------------------------------------------------------------

interface Spectrum {
  /** |X(k)|² for k = 0..n/2. */
  power: Float64Array;
  binHz: number;
  /** Factor from |X| to the amplitude of a sine (2 / Σ window). */
  amplitudeScale: number;
  /** Zero-padding factor (bins per independent bin, ≥ 1). */
  padding: number;
}

function powerSpectrum(segment: Float64Array, rateHz: number, padFactor = ZERO_PAD_FACTOR): Spectrum {
  const n = segment.length;
  const size = Math.max(4096, nextPowerOfTwo(padFactor * n));
  const re = new Float64Array(size);
  const im = new Float64Array(size);
  let windowSum = 0;
  for (let i = 0; i < n; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * (i + 0.5)) / n); // Hann
    re[i] = segment[i] * w;
    windowSum += w;
  }
  fftInPlace(re, im);
  const power = new Float64Array(size / 2 + 1);
  for (let k = 0; k < power.length; k++) power[k] = re[k] * re[k] + im[k] * im[k];
  return { power, binHz: rateHz / size, amplitudeScale: 2 / windowSum, padding: size / n };
}

function toDb(power: number): number {
  return 10 * Math.log10(Math.max(power, 1e-300));
}

/**
 * Spectral peaks in [lowHz, highHz] (window length windowS) with their height above the local noise floor
 * (median power within ±max(15 Hz, 25 %)); side lobes of stronger peaks are dropped.
 */
function findPeaks(spec: Spectrum, lowHz: number, highHz: number, windowS: number): Peak[] {
  const { power, binHz } = spec;
  const lo = Math.max(1, Math.ceil(lowHz / binHz));
  const hi = Math.min(power.length - 2, Math.floor(highHz / binHz));
  const mainLobe = Math.max(1, Math.round(2.5 / windowS / binHz));
  const sideLobe = Math.max(mainLobe, Math.round(6 / windowS / binHz));
  const peaks: Peak[] = [];
  for (let k = lo; k <= hi; k++) {
    const p = power[k];
    if (!(p > power[k - 1] && p >= power[k + 1])) continue;
    // Within the main lobe (±2.5/T) only the highest bin is a peak; out to ±6/T a far stronger neighbour
    // (Hann side lobes are ≥ 31 dB down) marks a side lobe, while a comparable one is a separate line.
    let isPeak = true;
    const from = Math.max(1, k - sideLobe);
    const to = Math.min(power.length - 1, k + sideLobe);
    for (let j = from; j <= to && isPeak; j++) {
      const limit = Math.abs(j - k) <= mainLobe ? p : p * SIDE_LOBE_RATIO;
      if (power[j] > limit) isPeak = false;
    }
    if (!isPeak) continue;

    const salienceDb = toDb(p) - toDb(localFloor(spec, k));
    if (salienceDb < PEAK_MIN_DB) continue;
    peaks.push({ frequencyHz: interpolatePeakHz(spec, k), power: p, salienceDb });
  }
  return peaks;
}

/** Local noise floor at bin k: median power within ±max(15 Hz, 25 %) of its frequency. */
function localFloor(spec: Spectrum, k: number): number {
  const { power, binHz } = spec;
  const fHz = k * binHz;
  const half = Math.max(15, 0.25 * fHz);
  const a = Math.max(1, Math.floor((fHz - half) / binHz));
  const b = Math.min(power.length - 1, Math.ceil((fHz + half) / binHz));
  // Zero-padded bins are correlated: sample at most one per independent bin, and no more than
  // FLOOR_SAMPLES of them (plenty for a median, and it bounds the cost).
  const stride = Math.max(1, Math.floor(spec.padding), Math.ceil((b - a + 1) / FLOOR_SAMPLES));
  const sample = new Float64Array(Math.floor((b - a) / stride) + 1);
  for (let i = 0, j = a; i < sample.length; i++, j += stride) sample[i] = power[j];
  return median(sample);
}

/** Parabolic (quadratic) interpolation on the dB spectrum: vertex of the parabola through k−1, k, k+1 [Hz]. */
function interpolatePeakHz(spec: Spectrum, k: number): number {
  const ya = toDb(spec.power[k - 1]);
  const yb = toDb(spec.power[k]);
  const yc = toDb(spec.power[k + 1]);
  const denom = ya - 2 * yb + yc;
  const delta = denom < 0 ? (0.5 * (ya - yc)) / denom : 0;
  return (k + delta) * spec.binHz;
}

function median(values: Float64Array): number {
  const sorted = values.slice().sort();
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}

// --- mains hum -------------------------------------------------------------------------------------------

/**
 * Removes steady mains lines before the pluck is analysed, so a belt ringing a few hertz from a mains
 * line is not pulled onto it. The lines are found in the file's quiet part (before the onset and after the
 * ring has decayed by 30 dB): a peak within ±1 Hz of 50·k or 60·k Hz standing ≥ 12 dB over the local floor.
 * Each is fitted there by least squares (a·cos ωt + b·sin ωt, frequency searched ±0.1 Hz in 0.01 Hz steps for
 * the best fit) and the fitted sinusoid is subtracted from the whole file. Needs ≥ 0.5 s of quiet, with a stretch of ≥ 0.25 s to find
 * the lines in; otherwise the signal is returned as is and only the steadiness test below applies.
 */
function cancelMainsHum(x: Float64Array, rateHz: number, ring: PluckWindow, topHz: number): HumCancellation {
  const pieces = [
    [0, ring.ringStart],
    [ring.ringEnd, x.length],
  ].filter(([a, b]) => b - a >= HUM_FIT_MIN_PIECE_S * rateHz);
  const quiet = pieces.reduce((sum, [a, b]) => sum + b - a, 0);
  if (quiet < HUM_FIT_MIN_QUIET_S * rateHz) return { signal: x, lines: [] };

  const [longA, longB] = pieces.reduce((l, p) => (p[1] - p[0] > l[1] - l[0] ? p : l));
  const longest = x.subarray(longA, Math.min(longB, longA + Math.round(HUM_FIT_MAX_SPECTRUM_S * rateHz)));
  const spec = powerSpectrum(longest, rateHz, 2);
  const lines: HumLine[] = [];
  for (const base of HUM_BASES_HZ) {
    for (let m = base; m <= topHz; m += base) {
      const lo = Math.max(1, Math.ceil((m - HUM_TOLERANCE_HZ) / spec.binHz));
      const hi = Math.min(spec.power.length - 2, Math.floor((m + HUM_TOLERANCE_HZ) / spec.binHz));
      let k = lo;
      for (let j = lo; j <= hi; j++) if (spec.power[j] > spec.power[k]) k = j;
      // The highest bin must be a true local maximum, not the skirt of something outside the ±1 Hz.
      if (!(spec.power[k] > spec.power[k - 1] && spec.power[k] >= spec.power[k + 1])) continue;
      const salienceDb = toDb(spec.power[k]) - toDb(localFloor(spec, k));
      const fHz = interpolatePeakHz(spec, k);
      // 50·6 = 60·5 = 300 Hz: one line, fitted once.
      if (salienceDb >= PEAK_MIN_DB && !lines.some((l) => Math.abs(l.frequencyHz - fHz) < 0.01)) {
        lines.push({ frequencyHz: fHz, salienceDb });
      }
    }
  }
  if (lines.length === 0) return { signal: x, lines };

  const cleaned = Float64Array.from(x);
  const cos = new Float64Array(x.length);
  const sin = new Float64Array(x.length);
  for (const line of lines) {
    // The spectrum of one quiet stretch places the line to a few hundredths of a hertz; the fit over all quiet
    // samples places it better (its phase must hold across the pluck), so search ±0.1 Hz for the best fit.
    let best = fitSinusoid(x, pieces, line.frequencyHz, rateHz);
    for (let step = -HUM_FIT_SEARCH_STEPS; step <= HUM_FIT_SEARCH_STEPS; step++) {
      const fit = fitSinusoid(x, pieces, line.frequencyHz + step * HUM_FIT_SEARCH_STEP_HZ, rateHz);
      if (fit.energy > best.energy) best = fit;
    }
    line.frequencyHz = best.frequencyHz;
    fillPhasor(cos, sin, (2 * Math.PI * best.frequencyHz) / rateHz);
    for (let n = 0; n < cleaned.length; n++) cleaned[n] -= best.a * cos[n] + best.b * sin[n];
  }
  return { signal: cleaned, lines };
}

interface SinusoidFit {
  frequencyHz: number;
  /** x ≈ a·cos(ωn) + b·sin(ωn) over the fitted samples. */
  a: number;
  b: number;
  /** Energy the fit explains (a·Σx·cos + b·Σx·sin); larger is a better frequency. */
  energy: number;
}

/** Least-squares fit of a·cos(ωn) + b·sin(ωn) to x over the given [from, to) sample ranges (normal equations). */
function fitSinusoid(x: Float64Array, pieces: number[][], frequencyHz: number, rateHz: number): SinusoidFit {
  const omega = (2 * Math.PI * frequencyHz) / rateHz;
  const cw = Math.cos(omega);
  const sw = Math.sin(omega);
  let cc = 0;
  let ss = 0;
  let cs = 0;
  let xc = 0;
  let xs = 0;
  for (const [from, to] of pieces) {
    let c = 0;
    let s = 0;
    for (let n = from; n < to; n++) {
      // Rotating phasor, re-anchored every 1024 samples against rounding drift.
      if ((n - from) % 1024 === 0) {
        c = Math.cos(omega * n);
        s = Math.sin(omega * n);
      }
      cc += c * c;
      ss += s * s;
      cs += c * s;
      xc += x[n] * c;
      xs += x[n] * s;
      const next = c * cw - s * sw;
      s = s * cw + c * sw;
      c = next;
    }
  }
  const det = cc * ss - cs * cs;
  if (!(det > 0)) return { frequencyHz, a: 0, b: 0, energy: 0 };
  const a = (xc * ss - xs * cs) / det;
  const b = (xs * cc - xc * cs) / det;
  return { frequencyHz, a, b, energy: a * xc + b * xs };
}

interface HumLine {
  frequencyHz: number;
  /** Height over the local floor in the quiet part [dB]. */
  salienceDb: number;
}

interface HumCancellation {
  /** The signal with the mains lines subtracted (the input itself when none were found). */
  signal: Float64Array;
  lines: HumLine[];
}

/** cos(ω·n), sin(ω·n) for every n by rotation, re-anchored every 1024 samples to stop rounding drift. */
function fillPhasor(cos: Float64Array, sin: Float64Array, omega: number): void {
  const cw = Math.cos(omega);
  const sw = Math.sin(omega);
  let c = 1;
  let s = 0;
  for (let n = 0; n < cos.length; n++) {
    if ((n & 1023) === 0) {
      c = Math.cos(omega * n);
      s = Math.sin(omega * n);
    }
    cos[n] = c;
    sin[n] = s;
    const next = c * cw - s * sw;
    s = s * cw + c * sw;
    c = next;
  }
}

function isNearMains(fHz: number): boolean {
  return HUM_BASES_HZ.some((base) => {
    const k = Math.round(fHz / base);
    return k >= 1 && Math.abs(fHz - k * base) <= HUM_TOLERANCE_HZ;
  });
}

/**
 * True when a line at fHz keeps the same level over the whole file, as mains hum does; a plucked span
 * rises at the onset and decays, so its level spreads by far more than ×1.5. Judged from the amplitude at fHz
 * in Hann segments of 0.25–0.5 s (a third of the file, hop half a segment): the 90th percentile over the 10th
 * must stay within ×1.5 (3.5 dB). Files too short for three segments (< 0.5 s) are never called hum.
 */
function isSteadyOverFile(x: Float64Array, rateHz: number, fHz: number): boolean {
  const spanS = x.length / rateHz;
  const segment = Math.round(Math.min(HUM_SEGMENT_MAX_S, Math.max(HUM_SEGMENT_MIN_S, spanS / 3)) * rateHz);
  const hop = segment >> 1;
  if (x.length < segment) return false;
  const count = Math.floor((x.length - segment) / hop) + 1;
  if (count < HUM_MIN_SEGMENTS) return false;
  const step = (2 * Math.PI * fHz) / rateHz;
  const cosW = new Float64Array(segment);
  const sinW = new Float64Array(segment);
  for (let i = 0; i < segment; i++) {
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * (i + 0.5)) / segment); // Hann
    cosW[i] = w * Math.cos(step * i);
    sinW[i] = w * Math.sin(step * i);
  }
  const amplitudes: number[] = [];
  for (let s = 0; s < count; s++) {
    let re = 0;
    let im = 0;
    const offset = s * hop;
    for (let i = 0; i < segment; i++) {
      re += x[offset + i] * cosW[i];
      im -= x[offset + i] * sinW[i];
    }
    amplitudes.push(Math.hypot(re, im));
  }
  amplitudes.sort((a, b) => a - b);
  const p10 = amplitudes[Math.floor(0.1 * (count - 1))];
  const p90 = amplitudes[Math.ceil(0.9 * (count - 1))];
  return p10 > 0 && p90 / p10 <= HUM_MAX_SPREAD;
}

// --- fundamental ------------------------------------------------------------------------------------------

/**
 * Harmonic sum with a penalty for gaps: Σ_h w_h·(salience of the peak at h·f0, or −6 dB when none is there),
 * w_h = 1/√h, over the harmonics that fit below the analysed top (at most 12). A candidate one octave too high
 * (the loud 2nd harmonic) collects only every other term of the true fundamental's series, so the true
 * fundamental wins even when its own peak is weaker; the gap penalty stops a low candidate (hum, a stray peak)
 * from winning on one far-up coincidence. Match tolerance: ±max(0.5/T, 1 % of h·f0).
 */
function scoreCandidate(candidate: Peak, peaks: Peak[], topHz: number, windowS: number): Candidate {
  const f0 = candidate.frequencyHz;
  const count = Math.max(1, Math.min(MAX_HARMONICS, Math.floor(topHz / f0)));
  const harmonics: (Peak | undefined)[] = [candidate];
  let score = candidate.salienceDb;
  for (let h = 2; h <= count; h++) {
    const target = h * f0;
    const tolerance = Math.max(0.5 / windowS, HARMONIC_TOLERANCE * target);
    let match: Peak | undefined;
    for (const p of peaks) {
      if (Math.abs(p.frequencyHz - target) <= tolerance && (!match || p.salienceDb > match.salienceDb)) match = p;
    }
    harmonics.push(match);
    score += (match ? match.salienceDb : -MISSING_HARMONIC_DB) / Math.sqrt(h);
  }
  return { peak: candidate, score, harmonics };
}

/**
 * The fundamental's own peak, unless that peak is weak (< 25 dB above the noise, e.g. a phone microphone
 * that rolls off the bass): then the 1st–3rd harmonics are combined as f_h/h, weighted by inverse variance
 * (∝ signal-to-noise power × h², since dividing by h shrinks the error h-fold). Only the first three, as a
 * stiff belt's higher overtones run slightly sharp.
 */
function refineFundamental(candidate: Candidate): number {
  if (candidate.peak.salienceDb >= STRONG_FUNDAMENTAL_DB) return candidate.peak.frequencyHz;
  let weightSum = 0;
  let sum = 0;
  candidate.harmonics.slice(0, 3).forEach((p, i) => {
    if (!p) return;
    const h = i + 1;
    const weight = 10 ** (p.salienceDb / 10) * h * h;
    weightSum += weight;
    sum += (weight * p.frequencyHz) / h;
  });
  return sum / weightSum;
}

// --- output ----------------------------------------------------------------------------------------------

function plotSpectrum(spec: Spectrum, topHz: number): { frequencyHz: number[]; magnitudeDb: number[] } {
  const last = Math.min(spec.power.length - 1, Math.floor(topHz / spec.binHz));
  const points = Math.min(SPECTRUM_POINTS, last + 1);
  const frequencyHz: number[] = [];
  const magnitudeDb: number[] = [];
  const ampDb = 20 * Math.log10(spec.amplitudeScale);
  for (let b = 0; b < points; b++) {
    const from = Math.floor((b * (last + 1)) / points);
    const to = Math.floor(((b + 1) * (last + 1)) / points);
    let bestK = from;
    for (let k = from; k < to; k++) if (spec.power[k] > spec.power[bestK]) bestK = k;
    frequencyHz.push(round(bestK * spec.binHz, 2));
    magnitudeDb.push(round(Math.max(-200, toDb(spec.power[bestK]) + ampDb), 1));
  }
  return { frequencyHz, magnitudeDb };
}

function clamp01(v: number): number {
  return Math.min(1, Math.max(0, v));
}

function round(v: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}
