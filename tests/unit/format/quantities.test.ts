/**
 * Unit conversions and number formatting of the Design desk. Factors are checked against NIST SP 811 (2008),
 * Appendix B.8: 1 in = 25.4 mm (exact), 1 ozf·in = 7.061 552 E-03 N·m, 1 lbf = 4.448 222 N, 1 lb = 0.453 592 37 kg.
 */
import { describe, expect, it } from 'vitest';
import { convert, formatNumber, formatQuantity, fromDisplay, parseNumberInput, toDisplay } from '@/format';

describe('convert', () => {
  it.each([
    // [value, from, to, expected, relative tolerance, source]
    [1, 'in', 'mm', 25.4, 1e-12, 'NIST SP 811 B.8: inch, exact'],
    [1, 'ozf in', 'N m', 7.061552e-3, 1e-6, 'NIST SP 811 B.8: ounce-force inch'],
    [1, 'lbf', 'N', 4.448222, 1e-6, 'NIST SP 811 B.8: pound-force'],
    [1, 'lb', 'kg', 0.45359237, 1e-12, 'NIST SP 811 B.8: pound (avoirdupois), exact'],
    [1, 'oz', 'g', 28.349523125, 1e-12, 'NIST SP 811 B.8: ounce (avoirdupois), exact'],
  ])('when %s %s is converted to %s, then it is %s (%s)', (value, from, to, expected, rel) => {
    // Act
    const out = convert(value, from, to);
    // Assert
    expect(Math.abs(out - expected) / expected).toBeLessThan(rel);
  });
});

describe('toDisplay / fromDisplay', () => {
  it('when 460 mm goes to inches and back, then the stored value is unchanged', () => {
    // Arrange
    const storedMm = 460;
    // Act
    const inches = toDisplay(storedMm, 'length', 'mm', 'imperial');
    const back = fromDisplay(inches, 'length', 'mm', 'imperial');
    // Assert
    expect(inches).toBeCloseTo(460 / 25.4, 12);
    expect(back).toBeCloseTo(460, 10);
  });

  it('when 0.45 N·m is shown in imperial, then it reads 0.45 / 7.061552e-3 oz·in (NIST SP 811 B.8)', () => {
    const ozIn = toDisplay(0.45, 'torque', 'N m', 'imperial');
    expect(ozIn).toBeCloseTo(0.45 / 7.061552e-3, 3);
    expect(fromDisplay(ozIn, 'torque', 'N m', 'imperial')).toBeCloseTo(0.45, 12);
  });

  it('when an acceleration stored in mm/s² is shown in metric, then it reads m/s²', () => {
    expect(toDisplay(5000, 'accel', 'mm/s^2', 'metric')).toBeCloseTo(5, 12);
  });

  it('when a unitless quantity is converted, then it stays as it is', () => {
    expect(toDisplay(20, 'teeth', '', 'imperial')).toBe(20);
  });
});

describe('formatNumber', () => {
  it.each([
    [460, '460'],
    [18.110236, '18.11'],
    [12345.6, '12,346'],
    [0.000246063, '0.000246'],
    [-3.5, '−3.5'],
    [0, '0'],
    [Number.NaN, '—'],
    [null, '—'],
  ])('when %s is formatted, then it reads %s', (value, expected) => {
    expect(formatNumber(value as number | null)).toBe(expected);
  });
});

describe('formatQuantity', () => {
  it('when a length is formatted in imperial, then the inch label follows the number', () => {
    expect(formatQuantity(460, 'length', 'mm', 'imperial')).toBe('18.11\u00a0in');
  });
});

describe('parseNumberInput', () => {
  it.each([
    ['18.5', 18.5],
    [' 18,5 ', 18.5],
    ['+2', 2],
    ['-0.5', -0.5],
    ['1e3', 1000],
  ])('when "%s" is typed, then it reads %s', (text, expected) => {
    expect(parseNumberInput(text)).toBe(expected);
  });

  it('when nothing is typed, then it is null', () => {
    expect(parseNumberInput('  ')).toBeNull();
  });

  it('when letters are typed, then it is NaN so the schema can say "must be a number"', () => {
    expect(parseNumberInput('12mm')).toBeNaN();
  });
});
