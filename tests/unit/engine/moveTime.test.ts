import { describe, expect, it } from 'vitest';
import { jerkLimitedMoveTimeS, moveTimeS } from '@/engine';
import { simulatedSCurveTimeS } from './helpers/sCurve';

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

describe('jerkLimitedMoveTimeS', () => {
  it.each([
    // [s mm, v mm/s, a mm/s², j mm/s³]: long move reaching v and a; long move where the jerk caps the acceleration;
    // short moves peaking below v with and without reaching a
    [300, 500, 10000, 500000],
    [300, 200, 10000, 100000],
    [10, 500, 10000, 500000],
    [2, 500, 10000, 100000],
    [80, 400, 3000, 20000],
  ])('when %d mm at %d mm/s, %d mm/s², %d mm/s³, then the closed form matches a stepped S-curve simulation (independent)', (s, v, a, j) => {
    // Act
    const closed = jerkLimitedMoveTimeS({ distanceMm: s, speedMmPerS: v, accelMmPerS2: a, jerkMmPerS3: j });
    const simulated = simulatedSCurveTimeS(s / 1000, v / 1000, a / 1000, j / 1000);
    // Assert
    expect(closed / simulated).toBeCloseTo(1, 5);
  });

  it('when the jerk is almost unlimited, then it tends to the trapezoidal time (derived: T_v → v/a)', () => {
    const trap = moveTimeS({ distanceMm: 100, speedMmPerS: 200, accelMmPerS2: 3000 });
    const jerk = jerkLimitedMoveTimeS({ distanceMm: 100, speedMmPerS: 200, accelMmPerS2: 3000, jerkMmPerS3: 1e12 });
    expect(jerk).toBeCloseTo(trap, 6);
  });

  it('when a short move never reaches the acceleration, then t = (32·s/j)^(1/3) (derived: pure jerk-limited move)', () => {
    expect(jerkLimitedMoveTimeS({ distanceMm: 1, speedMmPerS: 1000, accelMmPerS2: 1e6, jerkMmPerS3: 1e6 })).toBeCloseTo(
      Math.cbrt(32 / 1e6),
      12,
    );
  });

  it('when the distance is 0, then the move takes no time', () => {
    expect(jerkLimitedMoveTimeS({ distanceMm: 0, speedMmPerS: 100, accelMmPerS2: 1000, jerkMmPerS3: 1e5 })).toBe(0);
  });

  it('when the jerk is 0, then it throws naming jerkMmPerS3', () => {
    expect(() => jerkLimitedMoveTimeS({ distanceMm: 1, speedMmPerS: 100, accelMmPerS2: 1000, jerkMmPerS3: 0 })).toThrow(/jerkMmPerS3/);
  });
});
