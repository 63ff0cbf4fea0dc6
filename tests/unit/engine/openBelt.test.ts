import { describe, expect, it } from 'vitest';
import { openBeltLengthExactMm, openBeltLengthMm, teethInMesh, wrapAngleRad } from '@/engine';

const d20 = (20 * 2) / Math.PI;
const d60 = (60 * 2) / Math.PI;

describe('openBeltLengthMm', () => {
  it.each([
    // Shigley's Mechanical Engineering Design, ch. 17, Eq. 17-16a (from memory): BL-APPROX-20-60
    [150, d20, d60, 381.081],
    // equal pulleys: L = 2C + π·d (BL-EQUAL-20T)
    [300, d20, d20, 640],
  ])('when C = %d mm joins %d and %d mm pulleys, then the belt is %d mm (Shigley)', (centerMm, d1Mm, d2Mm, expected) => {
    expect(openBeltLengthMm({ centerMm, d1Mm, d2Mm })).toBeCloseTo(expected, 3);
  });

  it('when the pulleys overlap, then it throws naming centerMm', () => {
    expect(() => openBeltLengthMm({ centerMm: 10, d1Mm: 50, d2Mm: 10 })).toThrow(/\[openBeltLengthMm\] centerMm/);
  });
});

describe('openBeltLengthExactMm', () => {
  it('when C = 150 mm joins 20T and 60T (2 mm), then the exact length is 381.081 mm (Britannica 1911, Eq. 32 B)', () => {
    expect(openBeltLengthExactMm({ centerMm: 150, d1Mm: d20, d2Mm: d60 })).toBeCloseTo(381.081, 3);
  });
});

describe('wrapAngleRad', () => {
  it.each([
    // Shigley ch. 17, Eq. 17-1 (from memory): WRAP-20-60
    [150, d20, d60, 2.97162],
    [300, d20, d20, Math.PI],
  ])('when C = %d mm, then the small pulley wraps %d rad (Shigley)', (centerMm, d1Mm, d2Mm, expected) => {
    expect(wrapAngleRad({ centerMm, d1Mm, d2Mm })).toBeCloseTo(expected, 5);
  });
});

describe('teethInMesh', () => {
  it.each([
    // belt makers' practice: TIM = z·θ/(2π) (TIM-20-60 and TIM-16-90DEG)
    [20, 2.97162, 9.45897],
    [16, Math.PI / 2, 4],
  ])('when %i teeth wrap %d rad, then %d teeth are in mesh (common practice)', (teeth, wrapRad, expected) => {
    expect(teethInMesh({ teeth, wrapRad })).toBeCloseTo(expected, 4);
  });
});
