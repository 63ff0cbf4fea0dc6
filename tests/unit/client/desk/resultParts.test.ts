import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign } from '@/engine';
import { packResult, unpackResult } from '@/workers/resultParts';

const full = () => evaluateDesign({ ...defaultDesign('hbot'), map: { points: 21 } });

describe('packResult / unpackResult', () => {
  it('when every part is packed and unpacked, then the result equals the engine result', () => {
    // Arrange
    const result = full();

    // Act
    const { light, packed } = packResult(result, ['map', 'directions']);
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
