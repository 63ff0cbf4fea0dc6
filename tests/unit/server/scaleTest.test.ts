import { describe, expect, it } from 'vitest';
import { parseScaleArgs } from '../../../scripts/scale-test';
import { isError, percentile, phaseStats, table } from '../../../scripts/scale/stats';
import type { RequestRecord } from '../../../scripts/scale/client';

describe('parseScaleArgs', () => {
  it('when no option is given, then 20 users for 180 s on the 4600 block', () => {
    expect(parseScaleArgs([], {})).toMatchObject({ users: 20, durationS: 180, basePort: 4600, quick: false });
  });

  it('when --quick is given, then a short, light run', () => {
    expect(parseScaleArgs(['--quick'], {})).toMatchObject({ users: 8, durationS: 60, quick: true });
  });

  it('when options and the environment both set a value, then the option wins', () => {
    const parsed = parseScaleArgs(['--duration=300', '--users', '30'], { GW_SCALE_DURATION: '90', GW_SCALE_PORT_BASE: '4700' });
    expect(parsed).toMatchObject({ durationS: 300, users: 30, basePort: 4700 });
  });

  it.each([
    [['--duration', '10'], '--duration must be a whole number from 30 to 3600'],
    [['--users', 'many'], '--users must be a whole number from 1 to 200'],
    [['--base-port', '80'], '--base-port must be a whole number from 1024 to 65000'],
    [['--fast'], 'Unknown option --fast'],
  ])('when the arguments are %j, then it refuses them naming the option', (args, message) => {
    expect(() => parseScaleArgs(args, {})).toThrow(message);
  });
});

const req = (at: number, ms: number, status: number, code?: string, servedBy?: string): RequestRecord => ({
  at,
  ms,
  method: 'GET',
  route: '/api/x',
  status,
  code,
  servedBy,
});

describe('scale statistics', () => {
  it('when a percentile is asked of sorted values, then the nearest-rank value is returned', () => {
    const values = Array.from({ length: 100 }, (_, i) => i + 1);
    expect(percentile(values, 0.5)).toBe(50);
    expect(percentile(values, 0.99)).toBe(99);
    expect(percentile([7], 0.99)).toBe(7);
    expect(percentile([], 0.5)).toBe(0);
  });

  it('when answers are sorted into errors, then no answer, 5xx and an unresolved write conflict count, a stale-version 409 does not', () => {
    expect(
      [req(0, 1, 0, 'ECONNREFUSED'), req(0, 1, 502), req(0, 1, 503, 'db_unavailable'), req(0, 1, 409, 'write_conflict')].every(isError),
    ).toBe(true);
    expect([req(0, 1, 200), req(0, 1, 409, 'version_conflict'), req(0, 1, 429, 'rate_limited')].some(isError)).toBe(false);
  });

  it('when requests fall into phases by the time they ended, then each phase gets its own throughput, latency and errors', () => {
    // Arrange: phase A 0–10 s, phase B 10–20 s; one request started in A but was cut off in B, one ended after B.
    const phases = [
      { name: 'A', start: 0, end: 10_000 },
      { name: 'B', start: 10_000, end: 20_000 },
    ];
    const requests = [
      req(1000, 100, 200, undefined, 'app1'),
      req(2000, 300, 200, undefined, 'app2'),
      req(9500, 1000, 0, 'UND_ERR_SOCKET'),
      req(10_000, 50, 200, undefined, 'app1'),
      req(19_900, 400, 200, undefined, 'app3'),
    ];
    // Act
    const [a, b] = phaseStats(phases, requests, [5000, 15_000, 21_000]);
    // Assert
    expect(a).toMatchObject({ name: 'A', seconds: 10, requests: 2, perSecond: 0.2, journeys: 1, p50Ms: 100, p99Ms: 300, errors: 0 });
    expect(a.servedBy).toEqual({ app1: 1, app2: 1 });
    expect(b).toMatchObject({ requests: 3, journeys: 2, p50Ms: 50, p99Ms: 400, errors: 1 });
    expect(b.errorKinds).toEqual({ '0 UND_ERR_SOCKET': 1 });
  });

  it('when a table is printed, then the columns line up', () => {
    const text = table(
      ['phase', 'n'],
      [
        ['steady', 12],
        ['down', 3],
      ],
    );
    expect(text.split('\n')).toEqual(['phase    n', '------  --', 'steady  12', 'down     3']);
  });
});
