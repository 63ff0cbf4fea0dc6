import { describe, expect, it } from 'vitest';
import { fftInPlace, nextPowerOfTwo } from '../../../../server/uploads/fft';
import { mulberry32 } from './synthRecording';

/** Textbook O(n²) DFT, X_k = Σ x_n·e^(−2πi·kn/N), to check the fast transform against. */
function naiveDft(re: number[], im: number[]): { re: number[]; im: number[] } {
  const n = re.length;
  const outRe: number[] = [];
  const outIm: number[] = [];
  for (let k = 0; k < n; k++) {
    let sr = 0;
    let si = 0;
    for (let t = 0; t < n; t++) {
      const angle = (-2 * Math.PI * k * t) / n;
      sr += re[t] * Math.cos(angle) - im[t] * Math.sin(angle);
      si += re[t] * Math.sin(angle) + im[t] * Math.cos(angle);
    }
    outRe.push(sr);
    outIm.push(si);
  }
  return { re: outRe, im: outIm };
}

describe('fftInPlace', () => {
  it.each([1, 2, 8, 64, 256])('when %s random complex points are transformed, then the result matches the direct DFT', (n) => {
    // Arrange
    const random = mulberry32(n);
    const re = Array.from({ length: n }, () => random() - 0.5);
    const im = Array.from({ length: n }, () => random() - 0.5);
    const expected = naiveDft(re, im);
    const fastRe = Float64Array.from(re);
    const fastIm = Float64Array.from(im);
    // Act
    fftInPlace(fastRe, fastIm);
    // Assert
    for (let k = 0; k < n; k++) {
      expect(fastRe[k]).toBeCloseTo(expected.re[k], 9);
      expect(fastIm[k]).toBeCloseTo(expected.im[k], 9);
    }
  });

  it('when a cosine sits exactly on bin 5 of 32, then only bins 5 and 27 hold N/2 each', () => {
    // Arrange
    const n = 32;
    const re = Float64Array.from({ length: n }, (_, t) => Math.cos((2 * Math.PI * 5 * t) / n));
    const im = new Float64Array(n);
    // Act
    fftInPlace(re, im);
    // Assert
    const magnitudes = Array.from(re, (r, k) => Math.hypot(r, im[k]));
    expect(magnitudes[5]).toBeCloseTo(16, 9);
    expect(magnitudes[27]).toBeCloseTo(16, 9);
    expect(magnitudes.filter((_, k) => k !== 5 && k !== 27).every((m) => m < 1e-9)).toBe(true);
  });

  it.each([
    [3, 3],
    [12, 12],
    [8, 4],
  ])('when the lengths are %s and %s, then it throws RangeError', (reLength, imLength) => {
    // Arrange
    const re = new Float64Array(reLength);
    const im = new Float64Array(imLength);
    // Act / Assert
    expect(() => fftInPlace(re, im)).toThrow(RangeError);
  });
});

describe('nextPowerOfTwo', () => {
  it.each([
    [1, 1],
    [2, 2],
    [3, 4],
    [1000, 1024],
    [65536, 65536],
    [65537, 131072],
  ])('when asked for %s, then it returns %s', (n, expected) => {
    // Arrange / Act / Assert
    expect(nextPowerOfTwo(n)).toBe(expected);
  });
});
