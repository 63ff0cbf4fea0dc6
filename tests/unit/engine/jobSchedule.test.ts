import { describe, expect, it } from 'vitest';
import { scheduleJob, type DirectionLimits } from '@/engine';

/** Limits that are the same in every direction and at every speed. */
const flat = (accel: number, speed: number): DirectionLimits => ({ along: () => ({ speedMPerS: speed, accelMPerS2: () => accel }) });

describe('scheduleJob', () => {
  it.each([
    // elementary kinematics reference rows (derived: t = s/v + v/a or 2·√(s/a)): TRAP-LONG, TRAP-SHORT-TRI, TRAP-300MM
    [100, 0.2, 3, 0.566667],
    [5, 0.3, 5, 0.0632456],
    [300, 0.5, 10, 0.65],
  ])('when one %d mm move runs at %d m/s and %d m/s², then it takes %d s (derived: trapezoidal move time)', (dist, v, a, expected) => {
    // Arrange
    const points = [
      { xMm: 0, yMm: 0 },
      { xMm: dist, yMm: 0 },
    ];
    // Act
    const job = scheduleJob({
      points,
      limits: flat(a, 10),
      cruiseSpeedMPerS: v,
      plannedAccelMPerS2: a,
      jerkMPerS3: null,
      travel: { xMm: 400, yMm: 400 },
    });
    // Assert
    expect(job.totalS).toBeCloseTo(expected, 5);
    expect(job.moves[0]).toMatchObject({ fromIndex: 0, toIndex: 1, distanceMm: dist, directionDeg: 0 });
  });

  it('when each move has its own direction limits, then each move uses them and dwells add up', () => {
    // Arrange: the stage accelerates at 10 m/s² along the axes and at 2 m/s² along the diagonals
    const limits: DirectionLimits = {
      along: (th) => ({ speedMPerS: 1, accelMPerS2: () => (Math.abs(Math.sin(2 * th)) > 0.5 ? 2 : 10) }),
    };
    const points = [
      { xMm: 0, yMm: 0, dwellS: 0.1 },
      { xMm: 100, yMm: 0, dwellS: 0.2 },
      { xMm: 200, yMm: 100 },
    ];
    // Act
    const job = scheduleJob({
      points,
      limits,
      cruiseSpeedMPerS: 0.3,
      plannedAccelMPerS2: null,
      jerkMPerS3: null,
      travel: { xMm: 400, yMm: 400 },
    });
    // Assert: X move 0.1 m at 0.3 m/s, 10 m/s² → 0.1/0.3 + 0.3/10; diagonal √2·0.1 m at 0.3 m/s, 2 m/s²
    const x = 0.1 / 0.3 + 0.3 / 10;
    const d = (Math.SQRT2 * 0.1) / 0.3 + 0.3 / 2;
    expect(job.moves[0].timeS).toBeCloseTo(x, 10);
    expect(job.moves[1].timeS).toBeCloseTo(d, 10);
    expect(job.moves[1].directionDeg).toBeCloseTo(45, 10);
    expect(job.dwellS).toBeCloseTo(0.3, 12);
    expect(job.totalS).toBeCloseTo(x + d + 0.3, 10);
    expect(job.slowest).toEqual([1, 0]);
  });

  it('when the motors lose acceleration with speed, then the move peaks at the quickest speed (independent: dense scan)', () => {
    // Arrange: a(v) = 8·(1 − v/0.6) m/s², cruise allowed up to 0.5 m/s, 0.4 m move
    const limits: DirectionLimits = { along: () => ({ speedMPerS: 0.6, accelMPerS2: (v) => 8 * (1 - v / 0.6) }) };
    const s = 0.4;
    let best = Infinity;
    for (let i = 1; i <= 200000; i++) {
      const v = (0.5 * i) / 200000;
      const a = 8 * (1 - v / 0.6);
      const t = s >= (v * v) / a ? s / v + v / a : 2 * Math.sqrt(s / a);
      best = Math.min(best, t);
    }
    // Act
    const job = scheduleJob({
      points: [
        { xMm: 0, yMm: 0 },
        { xMm: 0, yMm: 400 },
      ],
      limits,
      cruiseSpeedMPerS: 0.5,
      plannedAccelMPerS2: null,
      jerkMPerS3: null,
      travel: { xMm: 500, yMm: 500 },
    });
    // Assert
    expect(job.moves[0].timeS! / best).toBeCloseTo(1, 7);
    expect(job.moves[0].limitedBy).toBe('motors');
    expect(job.moves[0].directionDeg).toBeCloseTo(90, 10);
  });

  it('when a jerk is set, then the moves take the S-curve time and say so', () => {
    // Act
    const points = [
      { xMm: 0, yMm: 0 },
      { xMm: 100, yMm: 0 },
    ];
    const trap = scheduleJob({
      points,
      limits: flat(3, 1),
      cruiseSpeedMPerS: 0.2,
      plannedAccelMPerS2: 3,
      jerkMPerS3: null,
      travel: { xMm: 200, yMm: 200 },
    });
    const jerk = scheduleJob({
      points,
      limits: flat(3, 1),
      cruiseSpeedMPerS: 0.2,
      plannedAccelMPerS2: 3,
      jerkMPerS3: 30,
      travel: { xMm: 200, yMm: 200 },
    });
    // Assert: a²/j = 0.3 m/s is above v = 0.2 m/s, so the jerk caps the acceleration and the ramp takes 2·√(v/j)
    expect(jerk.profile).toBe('jerk-limited');
    expect(jerk.totalS).toBeCloseTo(0.1 / 0.2 + 2 * Math.sqrt(0.2 / 30), 10);
    expect(jerk.totalS!).toBeGreaterThan(trap.totalS!);
  });

  it('when a point lies outside the travel and two points repeat, then it is listed and the repeat takes no time', () => {
    // Act
    const job = scheduleJob({
      points: [
        { xMm: 10, yMm: 10 },
        { xMm: 10, yMm: 10 },
        { xMm: 500, yMm: 10 },
      ],
      limits: flat(5, 1),
      cruiseSpeedMPerS: 0.3,
      plannedAccelMPerS2: null,
      jerkMPerS3: null,
      travel: { xMm: 300, yMm: 300 },
    });
    // Assert
    expect(job.outsideTravel).toEqual([2]);
    expect(job.moves[0].timeS).toBe(0);
    expect(job.slowest).toEqual([1]);
  });

  it('when the stage cannot move in a direction at all, then that move and the total have no time', () => {
    const job = scheduleJob({
      points: [
        { xMm: 0, yMm: 0 },
        { xMm: 50, yMm: 50 },
      ],
      limits: { along: () => ({ speedMPerS: 0, accelMPerS2: () => 0 }) },
      cruiseSpeedMPerS: 0.3,
      plannedAccelMPerS2: 3,
      jerkMPerS3: null,
      travel: { xMm: 300, yMm: 300 },
    });
    expect(job.moves[0].timeS).toBeNull();
    expect(job.totalS).toBeNull();
    expect(job.slowest).toEqual([0]);
  });

  it('when the job has a single point, then there are no moves and the total is its dwell', () => {
    const job = scheduleJob({
      points: [{ xMm: 1, yMm: 1, dwellS: 0.5 }],
      limits: flat(5, 1),
      cruiseSpeedMPerS: 0.3,
      plannedAccelMPerS2: null,
      jerkMPerS3: null,
      travel: { xMm: 300, yMm: 300 },
    });
    expect(job.moves).toEqual([]);
    expect(job.totalS).toBe(0.5);
  });
});
