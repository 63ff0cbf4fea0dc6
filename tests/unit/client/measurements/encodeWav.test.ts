import { describe, expect, it } from 'vitest';
import * as wavefile from 'wavefile';
import { encodeWav, meterPercent, rmsLevel } from '@/components/measurements/encodeWav';

const WaveFile: typeof wavefile.WaveFile =
  (wavefile as unknown as { WaveFile?: typeof wavefile.WaveFile }).WaveFile ??
  (wavefile as unknown as { default: { WaveFile: typeof wavefile.WaveFile } }).default.WaveFile;

describe('encodeWav', () => {
  it('when samples are encoded, then an independent WAV reader (wavefile) reads back 16-bit mono PCM at the rate with the same samples', () => {
    // Arrange: 10 ms of a 440 Hz tone at 48 kHz, half scale
    const rate = 48000;
    const samples = Float32Array.from({ length: 480 }, (_, i) => 0.5 * Math.sin((2 * Math.PI * 440 * i) / rate));
    // Act
    const bytes = new Uint8Array(encodeWav(samples, rate));
    const wav = new WaveFile(bytes);
    // Assert
    const fmt = wav.fmt as { audioFormat: number; numChannels: number; sampleRate: number; bitsPerSample: number };
    expect(fmt).toMatchObject({ audioFormat: 1, numChannels: 1, sampleRate: rate, bitsPerSample: 16 });
    const back = wav.getSamples(false, Int16Array) as unknown as Int16Array;
    expect(back.length).toBe(480);
    for (let i = 0; i < 480; i += 37) expect(back[i] / 32768).toBeCloseTo(samples[i], 4);
  });

  it('when samples pass full scale, then they are clipped to the 16-bit range instead of wrapping round', () => {
    const back = new WaveFile(new Uint8Array(encodeWav(Float32Array.from([1.5, -2, 1, -1]), 8000))).getSamples(
      false,
      Int16Array,
    ) as unknown as Int16Array;
    expect(Array.from(back)).toEqual([32767, -32768, 32767, -32768]);
  });

  it('when the sample rate is not a positive whole number, then it refuses naming the rate', () => {
    expect(() => encodeWav(new Float32Array(4), 0)).toThrow(/sample rate/);
  });
});

describe('meterPercent', () => {
  it.each([
    [0, 0],
    [0.001, 0], // −60 dBFS: the bottom of the meter
    [0.0316, 50], // −30 dBFS
    [1, 100], // full scale
  ])('when the RMS level is %s of full scale, then the meter shows %s %%', (rms, percent) => {
    expect(meterPercent(rms)).toBe(percent);
  });

  it('when a full-scale square wave is measured, then its RMS is 1 (and a sine’s is 1/√2)', () => {
    expect(rmsLevel(Float32Array.from([1, -1, 1, -1]))).toBeCloseTo(1, 9);
    const sine = Float32Array.from({ length: 1000 }, (_, i) => Math.sin((2 * Math.PI * i) / 100));
    expect(rmsLevel(sine)).toBeCloseTo(Math.SQRT1_2, 3);
  });
});
