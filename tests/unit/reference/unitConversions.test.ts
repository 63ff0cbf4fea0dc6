/**
 * NIST SP 811 Appendix B.8 conversion factors, checked through mathjs units — the library the client uses to
 * convert at the edge. mathjs 15 has no ounce-force: it is created here from its exact definition.
 * Provenance: reference/README.md.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { all, create } from 'mathjs';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

interface ConversionInputs {
  value: number;
  fromUnit: string;
  toUnit: string;
}

const factors = loadReference<ConversionInputs, { factor: number }>('nist-sp811', 'conversion-factors');
const conversions = loadReference<ConversionInputs, { converted: number }>('nist-sp811', 'conversions');

/** Exact avoirdupois ounce [kg] (lb/16, lb = 0.453 592 37 kg, SP 811 footnote 22) and standard gravity [m/s²]. */
const OUNCE_KG = 0.028349523125;
const STANDARD_GRAVITY_M_PER_S2 = 9.80665;

const math = create(all);

beforeAll(() => {
  // A private mathjs instance, so the global one stays untouched.
  math.createUnit('ozf', { definition: math.multiply(math.unit(OUNCE_KG, 'kg'), math.unit(STANDARD_GRAVITY_M_PER_S2, 'm/s^2')) });
});

describe('mathjs units against NIST SP 811 B.8 factors', () => {
  const cases = referenceCases(factors);

  it.each(cases)('when %s is converted, then mathjs gives the SP 811 factor', (_title, row) => {
    // Arrange
    const { value, fromUnit, toUnit } = row.inputs;
    // Act
    const factor = math.unit(value, fromUnit).toNumber(toUnit);
    // Assert
    expectWithinTolerance(factor, row.expected.factor, row.tolerance, `${row.id} ${fromUnit} → ${toUnit}`);
  });
});

describe('mathjs units on worked conversions', () => {
  const cases = referenceCases(conversions);

  it.each(cases)('when %s is converted, then mathjs gives the collected value', (_title, row) => {
    // Arrange
    const { value, fromUnit, toUnit } = row.inputs;
    // Act
    const converted = math.unit(value, fromUnit).toNumber(toUnit);
    // Assert
    expectWithinTolerance(converted, row.expected.converted, row.tolerance, `${row.id} ${value} ${fromUnit} → ${toUnit}`);
  });

  it('when mathjs is asked for ounce-force without the created unit, then it does not know it (why the test creates it)', () => {
    // Arrange
    const plain = create(all);
    // Act
    const convert = (): number => plain.unit(1, 'ozf').toNumber('N');
    // Assert
    expect(convert).toThrow(/ozf/);
  });
});
