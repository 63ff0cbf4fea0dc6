import { describe, expect, it } from 'vitest';
import { moveTimeS } from '@/engine';

describe('moveTimeS', () => {
  it.each([
    // elementary constant-acceleration kinematics (textbook attribution from memory): TRAP-LONG, TRAP-SHORT-TRI, TRAP-BOUNDARY, TRAP-300MM
    ['trapezoidal', 100, 200, 3000, 0.566667],
    ['triangular', 5, 300, 5000, 0.0632456],
    ['boundary', 18, 300, 5000, 0.12],
    ['trapezoidal', 300, 500, 10000, 0.65],
  ])('when a %s move of %d mm at %d mm/s and %d mm/s², then it takes %d s', (_kind, distanceMm, speedMmPerS, accelMmPerS2, expected) => {
    expect(moveTimeS({ distanceMm, speedMmPerS, accelMmPerS2 })).toBeCloseTo(expected, 5);
  });

  it('when the speed is zero, then it throws naming speedMmPerS', () => {
    expect(() => moveTimeS({ distanceMm: 10, speedMmPerS: 0, accelMmPerS2: 100 })).toThrow(/\[moveTimeS\] speedMmPerS/);
  });
});
