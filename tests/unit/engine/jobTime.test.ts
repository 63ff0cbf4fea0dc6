import { describe, expect, it } from 'vitest';
import { defaultDesign, EngineInputError, evaluateDesign, jobTime, moveTimeS } from '@/engine';

describe('jobTime', () => {
  const points = [
    { xMm: 10, yMm: 10, dwellS: 0.3 },
    { xMm: 190, yMm: 10 },
    { xMm: 40, yMm: 160, dwellS: 0.1 },
  ];

  it('when a design and points are given, then the result is the job section the full evaluation gives', () => {
    // Arrange
    const d = defaultDesign('corexy');
    // Act
    const job = jobTime({ design: d, points });
    // Assert
    expect(job).toEqual(evaluateDesign({ ...d, job: { points } }).job);
    expect(job.moves).toHaveLength(2);
  });

  it('when a move along X fits the plan, then it is the planned trapezoid (derived: elementary kinematics)', () => {
    const job = jobTime({ design: defaultDesign('corexy'), points: points.slice(0, 2) });
    expect(job.moves[0].timeS).toBeCloseTo(moveTimeS({ distanceMm: 180, speedMmPerS: 300, accelMmPerS2: 3000 }), 9);
    expect(job.totalS).toBeCloseTo(job.moves[0].timeS! + 0.3, 9);
  });

  it('when a point is bad, then it throws naming the point and field', () => {
    expect(() =>
      jobTime({
        design: defaultDesign('hbot'),
        points: [
          { xMm: 1, yMm: 1 },
          { xMm: 'x' as unknown as number, yMm: 1 },
        ],
      }),
    ).toThrow(expect.objectContaining({ issues: [{ path: 'points.1.xMm', message: 'job point X must be a number' }] }));
  });

  it('when the design is not a document, then it throws an EngineInputError naming design', () => {
    expect(() => jobTime({ design: null, points })).toThrow(EngineInputError);
  });

  it('when there are no points, then the job takes no time', () => {
    expect(jobTime({ design: defaultDesign('cartesian'), points: [] })).toMatchObject({ totalS: 0, moves: [], pointCount: 0 });
  });
});
