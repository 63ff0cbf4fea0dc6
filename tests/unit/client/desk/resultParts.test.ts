import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, MODE_LABELS } from '@/engine';
import { PACKED_MODE_IDS, packResult, RESULT_PARTS, unpackResult } from '@/workers/resultParts';

const full = () => evaluateDesign({ ...defaultDesign('hbot'), map: { points: 21 } });

describe('packResult / unpackResult', () => {
  it('when every part is packed and unpacked, then the result equals the engine result', () => {
    // Arrange
    const result = full();

    // Act
    const { light, packed } = packResult(result, RESULT_PARTS);
    const back = unpackResult(light, packed);

    // Assert
    expect(back).toEqual(result);
    expect(packed.values).toBeInstanceOf(Float64Array);
  });

  it('when only the map is packed, then the direction arrays are empty and the original result is untouched', () => {
    const result = full();
    const directions = result.envelope.directionsDeg.length;

    const { light, packed } = packResult(result, ['map']);
    const back = unpackResult(light, packed);

    expect(back.stiffness.lowestFrequencyHz).toEqual(result.stiffness.lowestFrequencyHz);
    expect(back.envelope.speedMaxMPerS).toEqual([]);
    expect(back.envelope.axes).toEqual(result.envelope.axes);
    expect(result.envelope.directionsDeg).toHaveLength(directions);
    // 21 × 21 grid + both axes: one Float64Array of 441 + 42 values
    expect(packed.values.length).toBe(21 * 21 + 42);
  });

  it('when the limiting motor is packed as numbers, then it comes back as A and B', () => {
    const result = full();

    const { light, packed } = packResult(result, ['directions']);

    expect(unpackResult(light, packed).envelope.limitingMotor).toEqual(result.envelope.limitingMotor);
  });
});

describe('packResult / unpackResult, the second layer maps', () => {
  it('when the mode and error maps are packed and unpacked, then they equal the engine result (mode ids by name)', () => {
    // Arrange
    const result = evaluateDesign({ ...defaultDesign('cartesian'), yMotors: 1, map: { points: 21 } });

    // Act
    const { light, packed } = packResult(result, ['modeMap', 'errorMap']);
    const back = unpackResult(light, packed);

    // Assert
    expect(back.stiffness.lowestMap).toEqual(result.stiffness.lowestMap);
    expect(back.errorBudget.totalMm).toEqual(result.errorBudget.totalMm);
    expect(back.stiffness.lowestFrequencyHz).toEqual([]);
    expect(packed.values.length).toBe(3 * 21 * 21);
  });

  it('when the mode map names a mode, then the packed list knows it (every mode id of the engine)', () => {
    // Arrange / Act / Assert
    expect([...PACKED_MODE_IDS].sort()).toEqual(Object.keys(MODE_LABELS).sort());
  });

  it('when only the small result is sent, then the second layer maps are empty and its summaries stay', () => {
    const result = full();

    const { light } = packResult(result, []);

    expect(light.errorBudget.totalMm).toEqual([]);
    expect(light.stiffness.lowestMap.modeId).toEqual([]);
    expect(light.errorBudget.worst).toEqual(result.errorBudget.worst);
    expect(light.stiffness.lowest).toEqual(result.stiffness.lowest);
  });
});
