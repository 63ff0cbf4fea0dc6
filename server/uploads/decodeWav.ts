import * as wavefile from 'wavefile';
import { PluckError } from './pluckError';

/** Sample formats a pluck recording may use. */
export type WavSampleFormat = '8' | '16' | '24' | '32' | '32f';

/** A decoded recording, mixed down to one channel. */
export interface DecodedWav {
  /** Mono samples, full scale = ±1. */
  samples: Float64Array;
  sampleRateHz: number;
  /** Channels in the file (before the mix-down). */
  channels: number;
  sampleFormat: WavSampleFormat;
  durationS: number;
}

/** Limits on what is accepted; the defaults are the product's (8–96 kHz, ≤ 10 s). */
export interface DecodeWavLimits {
  minRateHz: number;
  maxRateHz: number;
  maxDurationS: number;
}

/** The product's limits for a pluck recording. */
export const PLUCK_WAV_LIMITS: Readonly<DecodeWavLimits> = Object.freeze({
  minRateHz: 8000,
  maxRateHz: 96000,
  maxDurationS: 10,
});

const WAVE_FORMAT_PCM = 1;
const WAVE_FORMAT_IEEE_FLOAT = 3;
const WAVE_FORMAT_EXTENSIBLE = 0xfffe;

/** The parts of wavefile's `fmt` object we read (its typings declare it as `object`). */
interface WavFmt {
  audioFormat: number;
  numChannels: number;
  sampleRate: number;
  blockAlign: number;
  bitsPerSample: number;
  subformat?: number[];
}

interface WavData {
  chunkSize: number;
  samples: Uint8Array;
}

// wavefile ships CommonJS (main) and an ES module (module field): take the class from whichever shape
// the loader gives us, so tsx, Node and vitest all work.
const WaveFileClass: typeof wavefile.WaveFile =
  (wavefile as unknown as { WaveFile?: typeof wavefile.WaveFile }).WaveFile ??
  (wavefile as unknown as { default: { WaveFile: typeof wavefile.WaveFile } }).default.WaveFile;

const DAMAGED = 'The WAV file is damaged or incomplete — record the pluck again.';

function ascii(bytes: Uint8Array, start: number, length: number): string {
  return String.fromCharCode(...bytes.subarray(start, start + length));
}

function describeFormat(code: number, bits: number): string {
  if (code === WAVE_FORMAT_PCM) return `${bits}-bit integer PCM`;
  if (code === WAVE_FORMAT_IEEE_FLOAT) return `${bits}-bit float`;
  if (code === 6) return 'A-law';
  if (code === 7) return 'µ-law';
  if (code === 2 || code === 0x11) return 'ADPCM';
  if (code === 0x55) return 'MP3 in WAV';
  return `format code ${code}`;
}

/** "4.0 GB", "96 kB". */
function sizeWords(bytes: number): string {
  if (bytes >= 1024 ** 3) return `${(bytes / 1024 ** 3).toFixed(1)} GB`;
  if (bytes >= 1024 ** 2) return `${(bytes / 1024 ** 2).toFixed(1)} MB`;
  return `${Math.max(1, Math.round(bytes / 1024))} kB`;
}

/**
 * Refuses a header that claims more bytes than the file holds (issue 12, item 10: a header claiming 4 GB was
 * accepted when its data chunk happened to be consistent). RIFF/RIFX state the size after the first 8 bytes; RF64
 * states 0xFFFFFFFF there and the real 64-bit sizes in its ds64 chunk. One pad byte is allowed.
 */
function assertDeclaredSizeFits(u8: Uint8Array, riffId: string): void {
  const view = new DataView(u8.buffer, u8.byteOffset, u8.byteLength);
  const isBigEndian = riffId === 'RIFX';
  let declared = view.getUint32(4, !isBigEndian) + 8;
  if (riffId === 'RF64') {
    if (u8.length < 28 || ascii(u8, 12, 4) !== 'ds64') throw new PluckError('corrupt', DAMAGED);
    declared = Number(view.getBigUint64(20, true)) + 8;
  }
  if (declared > u8.length + 1) {
    throw new PluckError(
      'corrupt',
      `The WAV header says the file holds ${sizeWords(declared)}, but it holds ${sizeWords(u8.length)}: it is damaged or was cut off — record the pluck again.`,
    );
  }
}

/**
 * Decodes a WAV recording (RIFF/RIFX, PCM 8/16/24/32-bit integer or 32-bit float, mono or stereo)
 * with wavefile, checks it against the limits and mixes it down to one channel at full scale ±1.
 *
 * @param bytes - the uploaded file
 * @param limits - sample-rate and duration limits (default {@link PLUCK_WAV_LIMITS})
 * @returns the mono samples and what the file declared
 * @throws PluckError 'unsupported_format' (not WAV, compressed, > 2 channels, rate outside limits),
 *   'too_long', 'corrupt' (truncated or inconsistent header/data), 'no_tone' (no samples at all)
 */
export function decodeWav(bytes: Uint8Array, limits: DecodeWavLimits = PLUCK_WAV_LIMITS): DecodedWav {
  const u8 = new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (u8.length === 0) throw new PluckError('corrupt', 'The file is empty — record the pluck again.');

  const riffId = ascii(u8, 0, 4);
  const isRiff = riffId === 'RIFF' || riffId === 'RIFX' || riffId === 'RF64';
  if (!isRiff) {
    // A prefix of a RIFF header is a cut-off WAV, anything else is another kind of file.
    if (u8.length < 4 && 'RIFF'.startsWith(riffId)) throw new PluckError('corrupt', DAMAGED);
    throw new PluckError('unsupported_format', 'This is not a WAV recording — save or export the recording as WAV.');
  }
  if (u8.length < 12) throw new PluckError('corrupt', DAMAGED);
  if (ascii(u8, 8, 4) !== 'WAVE') {
    throw new PluckError('unsupported_format', 'This RIFF file holds no WAVE audio — save or export the recording as WAV.');
  }
  assertDeclaredSizeFits(u8, riffId);

  let wav: InstanceType<typeof wavefile.WaveFile>;
  try {
    wav = new WaveFileClass(u8);
  } catch (cause) {
    throw new PluckError('corrupt', DAMAGED, { cause });
  }
  const fmt = wav.fmt as unknown as WavFmt;
  const data = wav.data as unknown as WavData;

  const channels = fmt.numChannels;
  const bits = fmt.bitsPerSample;
  const code = fmt.audioFormat === WAVE_FORMAT_EXTENSIBLE ? (fmt.subformat?.[0] ?? 0) : fmt.audioFormat;
  if (!Number.isInteger(channels) || channels < 1) throw new PluckError('corrupt', DAMAGED);

  let sampleFormat: WavSampleFormat;
  if (code === WAVE_FORMAT_PCM && (bits === 8 || bits === 16 || bits === 24 || bits === 32)) {
    sampleFormat = String(bits) as WavSampleFormat;
  } else if (code === WAVE_FORMAT_IEEE_FLOAT && bits === 32) {
    sampleFormat = '32f';
  } else {
    throw new PluckError(
      'unsupported_format',
      `This WAV uses ${describeFormat(code, bits)}; record or export it as uncompressed WAV ` +
        '(8, 16, 24 or 32-bit integer, or 32-bit float).',
    );
  }
  if (channels > 2) {
    throw new PluckError('unsupported_format', `This WAV has ${channels} channels; record in mono or stereo.`);
  }
  const bytesPerSample = bits / 8;
  if (fmt.blockAlign !== channels * bytesPerSample) throw new PluckError('corrupt', DAMAGED);

  const rate = fmt.sampleRate;
  if (!Number.isInteger(rate) || rate <= 0) throw new PluckError('corrupt', DAMAGED);
  if (rate < limits.minRateHz || rate > limits.maxRateHz) {
    throw new PluckError(
      'unsupported_format',
      `The recording's sample rate is ${rate} Hz; record at ${limits.minRateHz / 1000}–${limits.maxRateHz / 1000} kHz ` +
        '(44.1 or 48 kHz is usual).',
    );
  }

  const available = data.samples.length;
  // wavefile slices the data chunk to what is there: fewer bytes than declared means a cut-off file.
  // (RF64 keeps the real size in its ds64 chunk and declares 0xFFFFFFFF here.)
  if (riffId !== 'RF64' && available < data.chunkSize) throw new PluckError('corrupt', DAMAGED);
  if (available % fmt.blockAlign !== 0) throw new PluckError('corrupt', DAMAGED);

  const frames = available / fmt.blockAlign;
  const durationS = frames / rate;
  if (frames === 0) throw new PluckError('no_tone', 'The recording holds no sound — record the pluck again.');
  if (durationS > limits.maxDurationS) {
    throw new PluckError(
      'too_long',
      `The recording is ${durationS.toFixed(1)} s long; keep it to ${limits.maxDurationS} s or less ` +
        '— start recording just before the pluck.',
    );
  }

  let interleaved: Float64Array;
  let scale: number;
  let offset = 0;
  if (sampleFormat === '32f' && fmt.audioFormat === WAVE_FORMAT_EXTENSIBLE) {
    // wavefile reads the sample type from the outer format code only, so an extensible-float file would be
    // taken as 32-bit integers: read the floats ourselves.
    const view = new DataView(data.samples.buffer, data.samples.byteOffset, data.samples.byteLength);
    const littleEndian = riffId !== 'RIFX';
    interleaved = new Float64Array(available / 4);
    for (let i = 0; i < interleaved.length; i++) interleaved[i] = view.getFloat32(i * 4, littleEndian);
    scale = 1;
  } else {
    try {
      interleaved = wav.getSamples(true, Float64Array) as Float64Array;
    } catch (cause) {
      throw new PluckError('corrupt', DAMAGED, { cause });
    }
    if (sampleFormat === '32f') scale = 1;
    else if (sampleFormat === '8') {
      // 8-bit WAV is unsigned with 128 as silence.
      scale = 1 / 128;
      offset = 128;
    } else scale = 1 / 2 ** (bits - 1);
  }
  if (interleaved.length !== frames * channels) throw new PluckError('corrupt', DAMAGED);

  const samples = new Float64Array(frames);
  const mix = scale / channels;
  for (let i = 0, j = 0; i < frames; i++) {
    let sum = 0;
    for (let c = 0; c < channels; c++, j++) sum += interleaved[j] - offset;
    const value = sum * mix;
    if (!Number.isFinite(value)) throw new PluckError('corrupt', DAMAGED);
    samples[i] = value;
  }

  return { samples, sampleRateHz: rate, channels, sampleFormat, durationS };
}
