/**
 * Pluck recordings: synthesised belt plucks (a decaying harmonic series, seeded white noise, steady 50 Hz and 60 Hz
 * mains hum) written with wavefile in every accepted format, and the bad recordings a maker may upload.
 */
import { describe, expect, it } from 'vitest';
import { spanFrequencyHz, tensionFromFrequencyN } from '@/engine';
import { analysePluck, PluckError, type PluckAnalysis } from '../../../../server/uploads';
import { expectWithinTolerance, loadReference, referenceCases } from '../../../helpers/loadReference';
import { gaussian, synthSamples, synthWav, typicalPluck, writeWav, type BitDepth, type RecordingSpec } from './synthRecording';
import { buildWav, int16Bytes } from './wavBytes';

/** Both mains frequencies at once (no real supply has both; it tests both rejections in one file), plus a 3rd harmonic. */
const MAINS_HUM: Array<[number, number]> = [
  [50, 0.03],
  [60, 0.02],
  [150, 0.01],
];

function analyse(spec: RecordingSpec, opts?: Parameters<typeof analysePluck>[1]): PluckAnalysis {
  return analysePluck(synthWav(spec), opts);
}

function pluckErrorOf(run: () => unknown): PluckError {
  try {
    run();
  } catch (err) {
    if (err instanceof PluckError) return err;
    throw err;
  }
  throw new Error('expected a PluckError, but the analysis succeeded');
}

// Each case synthesises and analyses seconds of audio; on a busy 2-core machine that can take a few seconds,
// so the timeout is a safety net only (speed is not asserted anywhere).
describe('analysePluck', { timeout: 30_000 }, () => {
  describe('frequency of synthesised plucks', () => {
    // [f0 Hz, sample rate Hz, bit depth, channels, duration s]
    const cases: Array<[number, number, BitDepth, 1 | 2, number]> = [
      [42.5, 8000, '16', 1, 2],
      [61.3, 16000, '24', 2, 2.5],
      [73.3, 44100, '16', 2, 3],
      [100, 96000, '24', 1, 2],
      [137.8, 48000, '32f', 2, 1.5],
      [196.4, 22050, '8', 1, 2],
      [455.5, 44100, '32', 1, 1.2],
      [880, 96000, '32f', 1, 1],
    ];

    it.each(cases)(
      'when a %s Hz pluck with overtones, noise and 50/60 Hz hum is recorded at %s Hz, %s-bit, %s channel(s), %s s, then the fundamental is found within 0.5 Hz',
      (f0, rate, bitDepth, channels, durationS) => {
        // Arrange
        const spec: RecordingSpec = {
          sampleRateHz: rate,
          durationS,
          bitDepth,
          channels,
          pluck: typicalPluck(f0),
          hum: MAINS_HUM,
          noiseRms: 0.01,
          seed: Math.round(f0),
        };
        // Act
        const result = analyse(spec);
        // Assert
        expect(Math.abs(result.frequencyHz - f0)).toBeLessThanOrEqual(0.5);
        expect(result.sampleRateHz).toBe(rate);
        expect(result.channels).toBe(channels);
        expect(result.durationS).toBeCloseTo(durationS, 3);
        expect(result.confidence).toBeGreaterThan(0.5);
        expect(result.confidence).toBeLessThanOrEqual(1);
        expect(Math.abs(result.harmonicsHz[0] - 2 * f0)).toBeLessThanOrEqual(1);
      },
    );
  });

  describe('fundamental against louder overtones', () => {
    // [case, f0, harmonic amplitudes (index = harmonic − 1)]
    const cases: Array<[string, number, number[]]> = [
      ['2nd harmonic 6 dB louder', 80, [0.25, 0.5, 0.2, 0.1]],
      ['2nd harmonic 12 dB louder', 64, [0.125, 0.5, 0.25, 0.12]],
      ['2nd harmonic 20 dB louder (bass-shy phone microphone)', 110, [0.05, 0.5, 0.3, 0.15]],
      ['3rd harmonic loudest', 57, [0.1, 0.2, 0.5, 0.1]],
      ['odd harmonics only (plucked at mid-span)', 90, [0.5, 0, 0.2, 0, 0.1]],
    ];

    it.each(cases)('when the recording has its %s, then the fundamental (%s Hz) is returned', (_name, f0, amplitudes) => {
      // Arrange
      const spec: RecordingSpec = {
        sampleRateHz: 44100,
        durationS: 2,
        pluck: typicalPluck(f0, { harmonicAmplitudes: amplitudes }),
        hum: MAINS_HUM,
        noiseRms: 0.005,
        seed: 7,
      };
      // Act
      const result = analyse(spec);
      // Assert
      expect(Math.abs(result.frequencyHz - f0)).toBeLessThanOrEqual(0.5);
    });
  });

  describe('mains hum', () => {
    // [case, belt f0, hum lines, pluck overrides, recording length s]
    const cases: Array<[string, number, Array<[number, number]>, Partial<ReturnType<typeof typicalPluck>>, number]> = [
      ['a belt at 100 Hz under loud 50 Hz hum', 100, [[50, 0.2]], {}, 2],
      [
        'a belt at 100 Hz under 50 Hz hum with its 100 Hz and 150 Hz harmonics',
        100,
        [
          [50, 0.15],
          [100, 0.03],
          [150, 0.05],
        ],
        {},
        2,
      ],
      [
        'a belt at 120 Hz under 60 Hz hum with its 120 Hz and 180 Hz harmonics',
        120,
        [
          [60, 0.15],
          [120, 0.03],
          [180, 0.05],
        ],
        {},
        2,
      ],
      ['a belt at 50 Hz over weaker 50 Hz hum', 50, [[50, 0.05]], {}, 2],
      [
        'a belt at 52.8 Hz, 2.8 Hz from loud 50 Hz hum',
        52.8,
        [
          [50, 0.1],
          [150, 0.03],
        ],
        { harmonicAmplitudes: [0.15, 0.1] },
        2.5,
      ],
      [
        'a weak pluck at 73 Hz under hum louder than the pluck',
        73,
        [
          [50, 0.3],
          [60, 0.2],
        ],
        { harmonicAmplitudes: [0.1, 0.05, 0.02] },
        2,
      ],
      ['a belt at 100 Hz under 50 Hz hum and no quiet part to fit the hum in', 100, [[50, 0.2]], { onsetS: 0.02 }, 0.9],
    ];

    it.each(cases)('when recording %s, then the belt frequency is found within 0.5 Hz', (_name, f0, hum, pluck, durationS) => {
      // Arrange
      const spec: RecordingSpec = {
        sampleRateHz: 44100,
        durationS,
        pluck: typicalPluck(f0, pluck),
        hum,
        noiseRms: 0.005,
        seed: 11,
      };
      // Act
      const result = analyse(spec);
      // Assert
      expect(Math.abs(result.frequencyHz - f0)).toBeLessThanOrEqual(0.5);
    });

    it('when the recording holds only steady mains hum and noise, then it throws no_tone naming the hum', () => {
      // Arrange
      const spec: RecordingSpec = {
        sampleRateHz: 44100,
        durationS: 3,
        hum: [
          [50, 0.2],
          [150, 0.05],
        ],
        noiseRms: 0.005,
        seed: 3,
      };
      // Act
      const error = pluckErrorOf(() => analyse(spec));
      // Assert
      expect(error.code).toBe('no_tone');
      expect(error.message).toMatch(/mains hum near 50 Hz/);
    });
  });

  describe('string law (Halliday–Resnick–Walker, Fundamentals of Physics, transverse waves on a string; chapter from memory)', () => {
    // The product's string law, f = (1/(2L))·√(T/μ) and T = 4·μ·L²·f² (the engine's, itself checked against the
    // published case in tests/unit/engine/tension.test.ts), so these tests follow the product's chain: tension →
    // pluck → analysis → tension.
    const frequencyOf = (tensionN: number, muKgPerM: number, spanM: number): number =>
      spanFrequencyHz({ tensionN, linearMassKgPerM: muKgPerM, spanMm: spanM * 1000 });
    const tensionOf = (frequencyHz: number, muKgPerM: number, spanM: number): number =>
      tensionFromFrequencyN({ frequencyHz, linearMassKgPerM: muKgPerM, spanMm: spanM * 1000 });

    // [tension N, μ kg/m, span m]; μ ≈ 7.5–8.5 g/m is a 6 mm glass-cord belt (from memory).
    const cases: Array<[number, number, number]> = [
      [20, 0.0075, 0.35],
      [12, 0.0084, 0.25],
      [45, 0.0084, 0.18],
      [8, 0.0075, 0.42],
    ];

    it.each(cases)(
      'when a span at %s N (μ %s kg/m, L %s m) is plucked, then the tension from the found frequency is within 1 %',
      (tensionN, mu, spanM) => {
        // Arrange
        const f0 = frequencyOf(tensionN, mu, spanM);
        const spec: RecordingSpec = { sampleRateHz: 48000, durationS: 2, pluck: typicalPluck(f0), hum: MAINS_HUM, noiseRms: 0.01, seed: 5 };
        // Act
        const measuredN = tensionOf(analyse(spec).frequencyHz, mu, spanM);
        // Assert
        expect(Math.abs(measuredN - tensionN) / tensionN).toBeLessThanOrEqual(0.01);
      },
    );

    const spanTension = loadReference<{ frequencyHz: number; linearMassKgPerM: number; spanMm: number }, { tensionN: number }>(
      'halliday-resnick-walker',
      'span-tension',
    );

    it.each(referenceCases(spanTension))(
      'when %s is plucked at its frequency, then the tension from the recording is within 1 % of the published one',
      (_title, row) => {
        // Arrange
        const { frequencyHz, linearMassKgPerM, spanMm } = row.inputs;
        const spec: RecordingSpec = {
          sampleRateHz: 44100,
          durationS: 2,
          pluck: typicalPluck(frequencyHz),
          hum: MAINS_HUM,
          noiseRms: 0.01,
          seed: 9,
        };
        // Act
        const measuredN = tensionOf(analyse(spec).frequencyHz, linearMassKgPerM, spanMm / 1000);
        // Assert
        expectWithinTolerance(measuredN, row.expected.tensionN, { rel: 0.01 }, `${row.id} tension from the recording`);
      },
    );
  });

  describe('recordings without a tone', () => {
    it.each([
      ['digital silence', { sampleRateHz: 44100, durationS: 2 }],
      ['near silence (−100 dBFS noise, 32-bit float)', { sampleRateHz: 44100, durationS: 2, bitDepth: '32f' as const, noiseRms: 1e-5 }],
    ])('when the recording is %s, then it throws no_tone saying it is silent', (_name, spec) => {
      // Arrange / Act
      const error = pluckErrorOf(() => analyse(spec));
      // Assert
      expect(error.code).toBe('no_tone');
      expect(error.message).toMatch(/silent/);
      expect(error.httpStatus).toBe(422);
    });

    it.each([
      [8000, 0.05, 1],
      [44100, 0.1, 2],
      [96000, 0.2, 3],
      [22050, 0.01, 4],
    ])(
      'when the recording at %s Hz is white noise of RMS %s (seed %s), then it throws no_tone asking to pluck closer',
      (rate, rms, seed) => {
        // Arrange
        const spec: RecordingSpec = { sampleRateHz: rate, durationS: 2, noiseRms: rms, seed };
        // Act
        const error = pluckErrorOf(() => analyse(spec));
        // Assert
        expect(error.code).toBe('no_tone');
        expect(error.message).toBe('No clear tone found — pluck closer to the microphone.');
      },
    );

    it('when the recording is shorter than half a second, then it throws no_tone asking for a longer one', () => {
      // Arrange
      const spec: RecordingSpec = { sampleRateHz: 44100, durationS: 0.3, pluck: typicalPluck(100, { onsetS: 0.02 }) };
      // Act
      const error = pluckErrorOf(() => analyse(spec));
      // Assert
      expect(error.code).toBe('no_tone');
      expect(error.message).toMatch(/half a second/);
    });

    it('when the only tone lies above the band, then it throws no_tone', () => {
      // Arrange
      const spec: RecordingSpec = {
        sampleRateHz: 44100,
        durationS: 2,
        pluck: typicalPluck(300, { harmonicAmplitudes: [0.5] }),
        noiseRms: 0.005,
      };
      // Act
      const error = pluckErrorOf(() => analyse(spec, { maxHz: 200 }));
      // Assert
      expect(error.code).toBe('no_tone');
    });
  });

  describe('files that cannot be measured', () => {
    const good = synthWav({ sampleRateHz: 8000, durationS: 1, pluck: typicalPluck(100), noiseRms: 0.01 });
    const withFmtIdBroken = Buffer.from(good);
    withFmtIdBroken.write('fmX ', 12, 'ascii');
    const floatWithNaN = writeWav(Float64Array.from([0, 0.1, NaN, 0.2, ...new Array(8000).fill(0)]), 8000, '32f');
    const alaw = buildWav({ formatTag: 6, channels: 1, sampleRateHz: 8000, bitsPerSample: 8, data: new Uint8Array(8000) });
    const pcm12 = buildWav({
      formatTag: 1,
      channels: 1,
      sampleRateHz: 8000,
      bitsPerSample: 12,
      blockAlign: 2,
      data: new Uint8Array(16000),
    });
    const threeChannels = buildWav({
      formatTag: 1,
      channels: 3,
      sampleRateHz: 8000,
      bitsPerSample: 16,
      data: int16Bytes(new Array(3 * 8000).fill(0)),
    });
    const wrongBlockAlign = buildWav({
      formatTag: 1,
      channels: 2,
      sampleRateHz: 8000,
      bitsPerSample: 16,
      blockAlign: 3,
      data: new Uint8Array(12000),
    });
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const avi = Buffer.concat([Buffer.from('RIFF'), Buffer.alloc(4), Buffer.from('AVI LIST'), Buffer.alloc(32)]);

    // [case, expected code, bytes]
    const cases: Array<[string, PluckError['code'], Uint8Array]> = [
      ['cut off in the middle of the samples', 'corrupt', good.subarray(0, good.length - 1001)],
      ['cut off right after the header', 'corrupt', good.subarray(0, 44)],
      ['cut off inside the header', 'corrupt', good.subarray(0, 30)],
      ['only "RIF"', 'corrupt', Buffer.from('RIF')],
      ['empty', 'corrupt', Buffer.alloc(0)],
      ['with its fmt chunk id overwritten', 'corrupt', withFmtIdBroken],
      ['with a block size that does not match its channels', 'corrupt', wrongBlockAlign],
      ['32-bit float holding NaN', 'corrupt', floatWithNaN],
      ['12 s long', 'too_long', synthWav({ sampleRateHz: 8000, durationS: 12, noiseRms: 0.01 })],
      ['sampled at 4 kHz', 'unsupported_format', synthWav({ sampleRateHz: 4000, durationS: 1, pluck: typicalPluck(100) })],
      ['sampled at 192 kHz', 'unsupported_format', synthWav({ sampleRateHz: 192000, durationS: 0.6, pluck: typicalPluck(100) })],
      ['A-law compressed', 'unsupported_format', alaw],
      ['12-bit PCM', 'unsupported_format', pcm12],
      ['three channels', 'unsupported_format', threeChannels],
      ['a PNG image', 'unsupported_format', png],
      ['a RIFF file holding video, not audio', 'unsupported_format', avi],
    ];

    it.each(cases)('when the file is %s, then it throws PluckError %s', (_name, code, bytes) => {
      // Arrange / Act
      const error = pluckErrorOf(() => analysePluck(bytes));
      // Assert
      expect(error.code).toBe(code);
      expect(error.message.length).toBeGreaterThan(20);
      expect(error.message).not.toMatch(/undefined|NaN|\[object/);
    });

    it('when the recording is exactly 10 s long, then it is accepted (the limit is inclusive)', () => {
      // Arrange
      const spec: RecordingSpec = { sampleRateHz: 8000, durationS: 10, pluck: typicalPluck(88, { onsetS: 4 }), noiseRms: 0.01 };
      // Act
      const result = analyse(spec);
      // Assert
      expect(result.durationS).toBe(10);
      expect(Math.abs(result.frequencyHz - 88)).toBeLessThanOrEqual(0.5);
    });
  });

  describe('spectrum and confidence', () => {
    it('when a pluck is analysed, then the spectrum has at most 512 ascending points peaking at the fundamental at a plausible level', () => {
      // Arrange
      const spec: RecordingSpec = { sampleRateHz: 44100, durationS: 2, pluck: typicalPluck(120), noiseRms: 0.01, seed: 2 };
      // Act
      const { spectrum } = analyse(spec);
      // Assert
      const { frequencyHz, magnitudeDb } = spectrum;
      expect(frequencyHz.length).toBe(magnitudeDb.length);
      expect(frequencyHz.length).toBeGreaterThan(100);
      expect(frequencyHz.length).toBeLessThanOrEqual(512);
      expect(frequencyHz.every((f, i) => i === 0 || f > frequencyHz[i - 1])).toBe(true);
      const top = magnitudeDb.indexOf(Math.max(...magnitudeDb));
      expect(Math.abs(frequencyHz[top] - 120)).toBeLessThanOrEqual(1);
      // The fundamental's amplitude is 0.5 (−6 dBFS) at the onset and decays inside the window.
      expect(magnitudeDb[top]).toBeLessThanOrEqual(-6);
      expect(magnitudeDb[top]).toBeGreaterThan(-30);
    });

    it('when the same pluck is recorded with more noise, then the confidence drops', () => {
      // Arrange
      const base: RecordingSpec = {
        sampleRateHz: 44100,
        durationS: 2,
        pluck: typicalPluck(95, { harmonicAmplitudes: [0.1, 0.05] }),
        seed: 4,
      };
      // Act
      const clean = analyse({ ...base, noiseRms: 0.001 });
      const noisy = analyse({ ...base, noiseRms: 0.03 });
      // Assert
      expect(Math.abs(noisy.frequencyHz - 95)).toBeLessThanOrEqual(0.5);
      expect(clean.confidence).toBeGreaterThan(noisy.confidence);
      expect(noisy.confidence).toBeGreaterThanOrEqual(0);
    });
  });

  describe('options', () => {
    it('when the band starts above a weak fundamental, then the strongest tone inside the band is returned', () => {
      // Arrange
      const spec: RecordingSpec = {
        sampleRateHz: 44100,
        durationS: 2,
        pluck: typicalPluck(80, { harmonicAmplitudes: [0.2, 0.5] }),
        noiseRms: 0.005,
      };
      // Act
      const result = analyse(spec, { minHz: 100 });
      // Assert
      expect(Math.abs(result.frequencyHz - 160)).toBeLessThanOrEqual(0.5);
    });

    it.each([[{ minHz: 0 }], [{ minHz: 200, maxHz: 100 }], [{ maxHz: Number.NaN }]])(
      'when the band is %o, then it throws RangeError',
      (opts) => {
        // Arrange
        const bytes = synthWav({ sampleRateHz: 8000, durationS: 1, pluck: typicalPluck(100) });
        // Act / Assert
        expect(() => analysePluck(bytes, opts)).toThrow(RangeError);
      },
    );
  });

  describe('synthesis helper', () => {
    it('when the same seed is used twice, then the noise is identical, and a different seed differs', () => {
      // Arrange
      const a = gaussian(42);
      const b = gaussian(42);
      const c = gaussian(43);
      // Act
      const first = [a(), a(), a()];
      const again = [b(), b(), b()];
      const other = [c(), c(), c()];
      // Assert
      expect(again).toEqual(first);
      expect(other).not.toEqual(first);
      expect(synthSamples({ sampleRateHz: 8000, durationS: 0.01, noiseRms: 1, seed: 42 })[0]).toBeCloseTo(first[0], 12);
    });
  });
});
