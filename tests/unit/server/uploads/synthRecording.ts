// Builds WAV files of synthetic belt plucks for the upload tests: a decaying harmonic series, seeded white
// noise and steady mains hum, written with wavefile in any of the accepted sample formats.
import * as wavefile from 'wavefile';

const WaveFileClass: typeof wavefile.WaveFile =
  (wavefile as unknown as { WaveFile?: typeof wavefile.WaveFile }).WaveFile ??
  (wavefile as unknown as { default: { WaveFile: typeof wavefile.WaveFile } }).default.WaveFile;

export type BitDepth = '8' | '16' | '24' | '32' | '32f';

export interface PluckSpec {
  /** Fundamental [Hz]. */
  f0Hz: number;
  /** Amplitude of harmonic h at index h−1 (full scale = 1). */
  harmonicAmplitudes: number[];
  /** Decay time constant of the fundamental [s]; harmonic h decays with τ/√h. */
  decayS: number;
  /** Time of the pluck from the start of the file [s]. */
  onsetS: number;
}

export interface RecordingSpec {
  sampleRateHz: number;
  durationS: number;
  bitDepth?: BitDepth;
  channels?: 1 | 2;
  pluck?: PluckSpec;
  /** Steady lines, e.g. mains hum: [frequency Hz, amplitude]. */
  hum?: Array<[number, number]>;
  /** Standard deviation of white Gaussian noise (full scale = 1). */
  noiseRms?: number;
  seed?: number;
}

/** Seeded PRNG (mulberry32), uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Seeded standard-normal generator (Box–Muller). */
export function gaussian(seed: number): () => number {
  const uniform = mulberry32(seed);
  return () => {
    const u = Math.max(uniform(), 1e-12);
    const v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

/** Synthesises the signal at full scale ±1 (mono). */
export function synthSamples(spec: RecordingSpec): Float64Array {
  const n = Math.round(spec.durationS * spec.sampleRateHz);
  const x = new Float64Array(n);
  const noise = gaussian(spec.seed ?? 1);
  for (let i = 0; i < n; i++) {
    const t = i / spec.sampleRateHz;
    let v = 0;
    const p = spec.pluck;
    if (p && t >= p.onsetS) {
      const tau = t - p.onsetS;
      p.harmonicAmplitudes.forEach((a, idx) => {
        const h = idx + 1;
        v += a * Math.sin(2 * Math.PI * h * p.f0Hz * tau) * Math.exp((-tau * Math.sqrt(h)) / p.decayS);
      });
    }
    for (const [f, a] of spec.hum ?? []) v += a * Math.sin(2 * Math.PI * f * t + 0.3);
    if (spec.noiseRms) v += spec.noiseRms * noise();
    x[i] = v;
  }
  return x;
}

/**
 * Converts full-scale samples to wavefile's integer/float codes for a bit depth: ±1 ↔ ±2^(bits−1), the usual
 * convention (−32768 is −1.0 in 16-bit), clipped to the code range; 8-bit is unsigned around 128.
 */
export function toCodes(x: Float64Array, bitDepth: BitDepth): number[] {
  if (bitDepth === '32f') return Array.from(x);
  if (bitDepth === '8') return Array.from(x, (v) => Math.max(0, Math.min(255, Math.round(v * 128 + 128))));
  const half = 2 ** (Number(bitDepth) - 1);
  return Array.from(x, (v) => Math.max(-half, Math.min(half - 1, Math.round(v * half))));
}

/** Writes samples as a WAV file; stereo puts the signal in both channels, the right one at 0.8×. */
export function writeWav(x: Float64Array, sampleRateHz: number, bitDepth: BitDepth = '16', channels: 1 | 2 = 1): Buffer {
  const wav = new WaveFileClass();
  if (channels === 1) wav.fromScratch(1, sampleRateHz, bitDepth, toCodes(x, bitDepth));
  else
    wav.fromScratch(2, sampleRateHz, bitDepth, [
      toCodes(x, bitDepth),
      toCodes(
        x.map((v) => 0.8 * v),
        bitDepth,
      ),
    ]);
  return Buffer.from(wav.toBuffer());
}

/** Synthesises and writes a recording in one go. */
export function synthWav(spec: RecordingSpec): Buffer {
  return writeWav(synthSamples(spec), spec.sampleRateHz, spec.bitDepth ?? '16', spec.channels ?? 1);
}

/** A typical pluck: fundamental plus a few weaker overtones. */
export function typicalPluck(f0Hz: number, overrides: Partial<PluckSpec> = {}): PluckSpec {
  return { f0Hz, harmonicAmplitudes: [0.5, 0.25, 0.12, 0.06], decayS: 0.4, onsetS: 0.3, ...overrides };
}
