import { EngineInputError } from './errors';
import { evaluateValidDesign } from './evaluateDesign';
import type { JobPoint, JobResult } from './jobSchedule';
import { safeParseDesign } from './schema';

/**
 * Times a job on a design: each move from point to point with its own direction's limits (trapezoidal, or
 * jerk-limited when the design's controller sets a jerk), the dwells, the total, the slowest moves and the same job
 * as fast as the motors allow — the `job` section of {@link evaluateValidDesign}'s result, on its own.
 * @param args.design - a design document (validated; its own job, if any, is replaced by `points`)
 * @param args.points - the job: X and Y in travel coordinates [mm], optional dwell [s]
 * @returns the job section
 * @throws EngineInputError naming the field ("points.3.xMm", "frame.outerXMm") when the design or a point is invalid
 * @see docs/models/job-timing.md
 */
export function jobTime(args: { design: unknown; points: JobPoint[] }): JobResult {
  const design = args?.design;
  if (design === null || typeof design !== 'object' || Array.isArray(design)) {
    throw new EngineInputError('jobTime', 'design: must be a design document', [{ path: 'design', message: 'must be a design document' }]);
  }
  if (!Array.isArray(args.points)) {
    throw new EngineInputError('jobTime', 'points: must be a list of points', [{ path: 'points', message: 'must be a list of points' }]);
  }
  // The job does not depend on the stiffness map: the smallest grid keeps this quick.
  const parsed = safeParseDesign({ ...(design as Record<string, unknown>), job: { points: args.points }, map: { points: 2 } });
  if (!parsed.ok) {
    const issues = parsed.issues.map((i) => ({ ...i, path: i.path.startsWith('job.') ? i.path.slice(4) : i.path }));
    throw new EngineInputError('jobTime', issues.map((i) => (i.path ? `${i.path}: ${i.message}` : i.message)).join('; '), issues);
  }
  const job = evaluateValidDesign(parsed.value).job;
  return (
    job ?? {
      totalS: 0,
      moveS: 0,
      dwellS: 0,
      profile: parsed.value.controller.jerkMmPerS3 !== null ? 'jerk-limited' : 'trapezoidal',
      pointCount: 0,
      moves: [],
      slowest: [],
      outsideTravel: [],
      atLimits: { totalS: 0, moveS: 0 },
    }
  );
}
