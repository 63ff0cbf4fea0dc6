import { describe, expect, it } from 'vitest';
import * as wavefile from 'wavefile';
import { decodeWav, PluckError, PLUCK_WAV_LIMITS } from '../../../../server/uploads';
import { writeWav, type BitDepth } from './synthRecording';
import { buildWav, float32Bytes, int16Bytes } from './wavBytes';

const WaveFileClass: typeof wavefile.WaveFile =
  (wavefile as unknown as { WaveFile?: typeof wavefile.WaveFile }).WaveFile ??
  (wavefile as unknown as { default: { WaveFile: typeof wavefile.WaveFile } }).default.WaveFile;

function decodeError(bytes: Uint8Array): PluckError {
  try {
    decodeWav(bytes);
  } catch (err) {
    if (err instanceof PluckError) return err;
    throw err;
  }
  throw new Error('expected a PluckError, but the file decoded');
}

describe('decodeWav', () => {
  // Rounding to the nearest code bounds the round-trip error by half a step (float32: its relative precision).
  const depths: Array<[BitDepth, number]> = [
    ['8', 0.5 / 128],
    ['16', 0.5 / 32768],
    ['24', 0.5 / 8388608],
    ['32', 0.5 / 2147483648],
    ['32f', 6e-8],
  ];

  it.each(depths)('when a %s-bit file holds a ramp, then it decodes to full scale ±1 within half a step (%s)', (bitDepth, step) => {
    // Arrange
    // −1 … +0.99: the positive end stays inside every format's code range (+127/128 in 8-bit).
    const ramp = Float64Array.from({ length: 200 }, (_, i) => -1 + i / 100);
    const bytes = writeWav(ramp, 8000, bitDepth);
    // Act
    const decoded = decodeWav(bytes);
    // Assert
    expect(decoded.sampleFormat).toBe(bitDepth);
    expect(decoded.samples.length).toBe(ramp.length);
    const worst = Math.max(...Array.from(decoded.samples, (v, i) => Math.abs(v - ramp[i])));
    expect(worst).toBeLessThanOrEqual(step * 1.0001);
  });

  it('when a stereo file is decoded, then the channels are averaged into one', () => {
    // Arrange: left +0.5, right −0.25 → mean 0.125
    const wav = new WaveFileClass();
    wav.fromScratch(2, 8000, '16', [new Array(10).fill(16384), new Array(10).fill(-8192)]);
    // Act
    const decoded = decodeWav(wav.toBuffer());
    // Assert
    expect(decoded.channels).toBe(2);
    expect(decoded.samples.length).toBe(10);
    expect(Array.from(decoded.samples).every((v) => Math.abs(v - 0.125) < 1e-12)).toBe(true);
  });

  it('when the file is extensible-format 32-bit float, then the samples are read as floats, not integers', () => {
    // Arrange
    const values = [0, 0.25, -0.5, 0.75, -1];
    const bytes = buildWav({
      formatTag: 0xfffe,
      subformat: 3,
      channels: 1,
      sampleRateHz: 48000,
      bitsPerSample: 32,
      data: float32Bytes(values),
    });
    // Act
    const decoded = decodeWav(bytes);
    // Assert
    expect(decoded.sampleFormat).toBe('32f');
    expect(Array.from(decoded.samples)).toEqual(values);
  });

  it('when the file is extensible-format 16-bit PCM, then it decodes like plain PCM', () => {
    // Arrange
    const bytes = buildWav({
      formatTag: 0xfffe,
      subformat: 1,
      channels: 1,
      sampleRateHz: 44100,
      bitsPerSample: 16,
      data: int16Bytes([0, 16384, -32768]),
    });
    // Act
    const decoded = decodeWav(bytes);
    // Assert
    expect(Array.from(decoded.samples)).toEqual([0, 0.5, -1]);
    expect(decoded.durationS).toBeCloseTo(3 / 44100, 12);
  });

  it('when the file is big-endian (RIFX), then it decodes the same values', () => {
    // Arrange
    const wav = new WaveFileClass();
    wav.fromScratch(1, 8000, '16', [0, 16384, -16384], { container: 'RIFX' });
    // Act
    const decoded = decodeWav(wav.toBuffer());
    // Assert
    expect(Array.from(decoded.samples)).toEqual([0, 0.5, -0.5]);
  });

  it.each([
    ['8 kHz, the lowest rate accepted', 8000, null],
    ['96 kHz, the highest rate accepted', 96000, null],
    ['7999 Hz', 7999, 'unsupported_format'],
    ['96001 Hz', 96001, 'unsupported_format'],
  ])('when the sample rate is %s, then the decoder %s', (_name, rate, code) => {
    // Arrange
    const bytes = buildWav({ formatTag: 1, channels: 1, sampleRateHz: rate, bitsPerSample: 16, data: int16Bytes(new Array(100).fill(0)) });
    // Act / Assert
    if (code === null) expect(decodeWav(bytes).sampleRateHz).toBe(rate);
    else expect(decodeError(bytes).code).toBe(code);
  });

  it('when the data chunk declares more bytes than the file holds, then it throws corrupt', () => {
    // Arrange
    const bytes = buildWav({
      formatTag: 1,
      channels: 1,
      sampleRateHz: 8000,
      bitsPerSample: 16,
      data: int16Bytes([1, 2, 3, 4]),
      declaredDataSize: 400,
    });
    // Act
    const error = decodeError(bytes);
    // Assert
    expect(error.code).toBe('corrupt');
    expect(error.message).toMatch(/damaged or incomplete/);
  });

  it('when the data chunk is empty, then it throws no_tone (nothing was recorded)', () => {
    // Arrange
    const bytes = buildWav({ formatTag: 1, channels: 1, sampleRateHz: 8000, bitsPerSample: 16, data: new Uint8Array(0) });
    // Act / Assert
    expect(decodeError(bytes).code).toBe('no_tone');
  });

  it('when the limits are the product defaults, then they are 8–96 kHz and 10 s', () => {
    // Arrange / Act / Assert
    expect(PLUCK_WAV_LIMITS).toEqual({ minRateHz: 8000, maxRateHz: 96000, maxDurationS: 10 });
    expect(Object.isFrozen(PLUCK_WAV_LIMITS)).toBe(true);
  });

  it('when a file is 10.001 s long, then it throws too_long saying how long it is', () => {
    // Arrange
    const bytes = buildWav({ formatTag: 1, channels: 1, sampleRateHz: 8000, bitsPerSample: 16, data: new Uint8Array(2 * 80008) });
    // Act
    const error = decodeError(bytes);
    // Assert
    expect(error.code).toBe('too_long');
    expect(error.message).toMatch(/10\.0 s long; keep it to 10 s or less/);
  });
});

describe('decodeWav — declared sizes', () => {
  const oneSecond = () =>
    buildWav({
      formatTag: 1,
      channels: 1,
      sampleRateHz: 8000,
      bitsPerSample: 16,
      data: int16Bytes(Array.from({ length: 8000 }, (_, i) => Math.round(8000 * Math.sin(i / 5)))),
    });

  // fix: #12 — a header claiming 4 GB was accepted when its data chunk happened to be consistent.
  it('when the RIFF header claims 4 GB for a small file, then it throws corrupt, naming both sizes', () => {
    // Arrange
    const wav = oneSecond();
    wav.writeUInt32LE(0xfffffff8, 4);
    // Act
    const error = decodeError(wav);
    // Assert
    expect(error.code).toBe('corrupt');
    expect(error.message).toBe(
      'The WAV header says the file holds 4.0 GB, but it holds 16 kB: it is damaged or was cut off — record the pluck again.',
    );
  });

  it('when an RF64 file has no ds64 chunk, or its ds64 claims more than the file holds, then it throws corrupt', () => {
    // Arrange
    const wav = oneSecond();
    wav.write('RF64', 0, 'ascii');
    wav.writeUInt32LE(0xffffffff, 4);
    // Assert
    expect(decodeError(wav).code).toBe('corrupt');
  });

  it('when the RIFF size is exact (or one pad byte over), then the file decodes', () => {
    const wav = oneSecond();
    expect(decodeWav(wav).durationS).toBeCloseTo(1, 9);
    wav.writeUInt32LE(wav.length - 7, 4);
    expect(decodeWav(wav).durationS).toBeCloseTo(1, 9);
  });
});
