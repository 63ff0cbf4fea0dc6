import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, secondLayerChecks, type DesignInput, type SecondLayerResult } from '@/engine';

function checksOf(edit: (d: DesignInput) => DesignInput) {
  return evaluateDesign(edit({ ...defaultDesign('corexy'), map: { points: 11 } })).checks;
}

describe('secondLayerChecks', () => {
  it('when the controller gives fewer steps than the cruise needs, then step-rate fails naming the limit and the speed it allows', () => {
    // Act
    const c = checksOf((d) => ({ ...d, controller: { maxStepRateHz: 10000, jerkMmPerS3: null } })).find((x) => x.id === 'step-rate')!;
    // Assert
    expect(c.severity).toBe('fail');
    expect(c.kind).toBe('frequencyHz');
    expect(c.limit).toBe(10000);
    expect(c.message).toMatch(/above the Controller step rate limit of 10000 Hz/);
    expect(c.parts.some((p) => typeof p === 'object' && p.kind === 'speedMPerS')).toBe(true);
  });

  it('when the controller keeps up with cruise but not with the top speed, then step-rate warns', () => {
    const probe = evaluateDesign({ ...defaultDesign('corexy'), map: { points: 11 } }).excitation;
    const between = (probe.microstepRateHzAtCruise + probe.microstepRateHzAtTop) / 2;
    const c = checksOf((d) => ({ ...d, controller: { maxStepRateHz: between, jerkMmPerS3: null } })).find((x) => x.id === 'step-rate')!;
    expect(c.severity).toBe('warn');
    expect(c.message).toMatch(/the controller, not the motors, sets the top speed/);
  });

  it.each([
    [200, 'ok'],
    [70, 'warn'],
    [40, 'fail'],
  ] as const)('when the motor shaft rating is %d N, then the motor-shaft load check is %s', (rating, severity) => {
    // Arrange: 40 N pretension on a half-turn wrap presses each motor shaft with about 80 N
    const c = checksOf((d) => ({ ...d, radialLoadRating: { motorShaftN: rating, idlerN: 500 } })).find(
      (x) => x.id === 'shaft-load' && x.subject === 'Motor shafts',
    )!;
    // Assert
    expect(c.severity).toBe(severity);
    expect(c.limit).toBe(rating);
    expect(c.message).toContain('Motor shaft radial load rating');
  });

  it('when a job point lies outside the travel, then job-travel fails naming it; without a job there is no job check', () => {
    const withJob = checksOf((d) => ({
      ...d,
      job: {
        points: [
          { xMm: 10, yMm: 10, dwellS: 0 },
          { xMm: 9000, yMm: 10, dwellS: 0 },
        ],
      },
    }));
    expect(withJob.find((x) => x.id === 'job-travel')).toMatchObject({ severity: 'fail', value: 1, subject: 'Job' });
    expect(withJob.find((x) => x.id === 'job-travel')!.message).toMatch(/^Job: point 2 lies outside the travel/);
    expect(checksOf((d) => d).some((x) => x.id.startsWith('job-'))).toBe(false);
  });

  it('when a move cannot be made, then job-moves fails naming its points', () => {
    // Arrange: the real second layer with a job whose second move has no time
    const second = evaluateDesign({
      ...defaultDesign('corexy'),
      map: { points: 5 },
      job: {
        points: [
          { xMm: 1, yMm: 1 },
          { xMm: 50, yMm: 50 },
        ],
      },
    }) as unknown as SecondLayerResult;
    const job = { ...second.job!, totalS: null, moves: [{ ...second.job!.moves[0], timeS: null }] };
    // Act
    const checks = secondLayerChecks({ second: { ...second, job }, cruiseSpeedMPerS: 0.3, travel: { xMm: 200, yMm: 200 } });
    // Assert
    expect(checks.find((x) => x.id === 'job-moves')).toMatchObject({ severity: 'fail' });
    expect(checks.find((x) => x.id === 'job-moves')!.message).toMatch(/from point 1 to point 2 cannot be made/);
  });
});
