import { makeCheck, qty, severityOf } from './checkText';
import type { SecondLayerResult } from './secondLayer';
import type { Check } from './types';

// The checks of the second layer (docs/models/checks.md and the model pages under docs/models/).

/** Within this share of the controller's step-rate limit the step-rate check warns (our judgement, as the other checks). */
export const STEP_RATE_WARN_SHARE = 0.9;
/** A radial load above this many times its rating fails; between the rating and this it warns (bearing life, our judgement). */
export const SHAFT_LOAD_FAIL_FACTOR = 1.5;

function stepRateCheck(second: SecondLayerResult): Check {
  const e = second.excitation;
  const need = e.microstepRateHzAtCruise;
  const limit = e.stepRateLimitHz;
  const over = need > limit;
  const topOver = e.microstepRateHzAtTop > limit;
  const near = need > STEP_RATE_WARN_SHARE * limit;
  const parts: Check['parts'] = over
    ? [
        'At the Cruise speed the fastest motor needs ',
        qty(need, 'frequencyHz'),
        ' microsteps per second, above the Controller step rate limit of ',
        qty(limit, 'frequencyHz'),
        '; that limit allows at most ',
        qty(e.speedAtStepLimitMPerS, 'speedMPerS'),
        ' in every direction. Lower the Microsteps or the Cruise speed, or use a faster controller.',
      ]
    : [
        'At the Cruise speed the fastest motor needs ',
        qty(need, 'frequencyHz'),
        ' microsteps per second, within the Controller step rate limit of ',
        qty(limit, 'frequencyHz'),
        ...(topOver
          ? [
              '; at the stage’s top speed it would need ',
              qty(e.microstepRateHzAtTop, 'frequencyHz'),
              ', so the controller, not the motors, sets the top speed.',
            ]
          : ['.']),
      ];
  return makeCheck({ id: 'step-rate', severity: severityOf(over, near || topOver), value: need, limit, kind: 'frequencyHz', parts });
}

function shaftLoadChecks(second: SecondLayerResult): Check[] {
  const out: Check[] = [];
  for (const [kind, subject, ratingLabel] of [
    ['drive', 'Motor shafts', 'Motor shaft radial load rating'],
    ['idler', 'Idlers', 'Idler radial load rating'],
  ] as const) {
    const pulleys = second.loads.pulleys.filter((p) => p.kind === kind);
    if (pulleys.length === 0) continue;
    const worst = pulleys.reduce((a, b) => (b.atPeakN > a.atPeakN ? b : a));
    const rating = worst.ratingN;
    const over = worst.atPeakN > rating;
    const fail = worst.atPeakN > SHAFT_LOAD_FAIL_FACTOR * rating;
    out.push(
      makeCheck({
        id: 'shaft-load',
        subject,
        severity: severityOf(fail, over),
        value: worst.atPeakN,
        limit: rating,
        kind: 'forceN',
        parts: [
          `${subject}: the belt arms press ${worst.label} with up to `,
          qty(worst.atPeakN, 'forceN'),
          ' at peak pull (',
          qty(worst.atPretensionN, 'forceN'),
          ' at the Belt pretension), ',
          over ? 'above the ' : 'within the ',
          `${ratingLabel} of `,
          qty(rating, 'forceN'),
          over
            ? fail
              ? '; the bearings will wear out early — lower the pretension or use a stronger part.'
              : ': a shorter bearing life.'
            : '.',
        ],
      }),
    );
  }
  return out;
}

function jobChecks(second: SecondLayerResult, travel: { xMm: number; yMm: number }): Check[] {
  const job = second.job;
  if (!job) return [];
  const outside = job.outsideTravel;
  const list = outside
    .slice(0, 8)
    .map((i) => i + 1)
    .join(', ');
  const out: Check[] = [
    makeCheck({
      id: 'job-travel',
      subject: 'Job',
      severity: severityOf(outside.length > 0, false),
      value: outside.length,
      limit: 0,
      kind: 'count',
      parts:
        outside.length > 0
          ? [
              `Job: point${outside.length === 1 ? '' : 's'} ${list}${outside.length > 8 ? ' …' : ''} lie${outside.length === 1 ? 's' : ''} outside the travel of `,
              qty(travel.xMm, 'lengthMm'),
              ' × ',
              qty(travel.yMm, 'lengthMm'),
              '.',
            ]
          : ['Job: every point lies within the travel.'],
    }),
  ];
  if (job.totalS === null) {
    const stuck = job.moves.findIndex((m) => m.timeS === null);
    out.push(
      makeCheck({
        id: 'job-moves',
        subject: 'Job',
        severity: 'fail',
        value: null,
        limit: null,
        kind: 'count',
        parts: [
          `Job: the move from point ${job.moves[stuck].fromIndex + 1} to point ${job.moves[stuck].toIndex + 1} cannot be made: the motors give no acceleration toward `,
          qty(job.moves[stuck].directionDeg, 'angleDeg'),
          '.',
        ],
      }),
    );
  }
  return out;
}

/**
 * The second layer's checks: the controller's step rate, the radial loads on motor shafts and idlers, and, with a
 * job, its points against the travel and its moves against what the motors give.
 * @param args.second - the second layer's sections
 * @param args.cruiseSpeedMPerS - cruise speed [m/s] (named in the messages through the excitation figures)
 * @param args.travel - usable travel [mm]
 * @returns checks with ids step-rate, shaft-load (subject "Motor shafts" / "Idlers"), job-travel, job-moves
 * @see docs/models/excitation.md, docs/models/shaft-loads.md, docs/models/job-timing.md
 */
export function secondLayerChecks(args: {
  second: SecondLayerResult;
  cruiseSpeedMPerS: number;
  travel: { xMm: number; yMm: number };
}): Check[] {
  return [stepRateCheck(args.second), ...shaftLoadChecks(args.second), ...jobChecks(args.second, args.travel)];
}
