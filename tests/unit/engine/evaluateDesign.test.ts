import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { safeParseDesign } from '@/engine';
import { wideRandomDocument } from './helpers/randomDesign';
import {
  ENGINE_VERSION,
  EngineInputError,
  beltGeometryAt,
  defaultDesign,
  evaluateDesign,
  spanFrequencyHz,
  type DesignResult,
} from '@/engine';

const EXAMPLES = fileURLToPath(new URL('../../../reference/examples/', import.meta.url));
const demos = readdirSync(EXAMPLES)
  .filter((f) => f.endsWith('.json'))
  .map((f) => [f, JSON.parse(readFileSync(EXAMPLES + f, 'utf8'))] as const);

/** Every result field the design document's readers rely on (src/engine/README.md "Result"). */
const FORMAT_FIELDS = [
  'engineVersion',
  'kinematics.matrix',
  'drive.pitchDiameterMm',
  'drive.travelPerRevMm',
  'drive.stepsPerMm',
  'drive.fullStepMm',
  'drive.microstep.oneMotorMm',
  'drive.microstep.oneMotorDirectionDeg',
  'drive.microstep.axisMm',
  'drive.microstep.diagonalMm',
  'travel.xMm',
  'travel.yMm',
  'mass.xKg',
  'mass.yKg',
  'mass.reflectedPerMotorKg',
  'envelope.directionsDeg',
  'envelope.accelMaxMPerS2',
  'envelope.accelAtCruiseMPerS2',
  'envelope.speedMaxMPerS',
  'envelope.limitingMotor',
  'coupling.speedShare.a',
  'coupling.speedShare.b',
  'coupling.forceShare.a',
  'coupling.forceShare.b',
  'belts',
  'stiffness.xMm',
  'stiffness.yMm',
  'stiffness.lowestFrequencyHz',
  'stiffness.min.frequencyHz',
  'stiffness.min.xMm',
  'stiffness.min.yMm',
  'partsList',
  'racking.momentPerNewtonM',
  'checks',
  ...['x', 'y', 'diagonal', 'worst'].flatMap((a) =>
    ['directionDeg', 'accelMaxMPerS2', 'accelAtCruiseMPerS2', 'speedMaxMPerS'].map((f) => `envelope.axes.${a}.${f}`),
  ),
  ...['x', 'y', 'worst'].flatMap((a) => ['amplitudeMm', 'accelForToleranceMPerS2'].map((f) => `stiffness.ringing.${a}.${f}`)),
  // Second version of the surface: the second layer
  ...['stretchMm', 'loadAngleMm', 'deadbandMm', 'runoutMm', 'totalMm', 'xMm', 'yMm', 'directionDeg'].map((f) => `errorBudget.worst.${f}`),
  'errorBudget.totalMm',
  'modes',
  ...['frequencyHz', 'modeId', 'xMm', 'yMm'].map((f) => `stiffness.lowest.${f}`),
  ...['frequencyHz', 'zvDurationS', 'zvdDurationS'].map((f) => `shaping.${f}`),
  ...['toothMeshHzAtCruise', 'fullStepRateHzAtTop', 'microstepRateHzAtTop', 'stepRateLimitHz'].map((f) => `excitation.${f}`),
  'heat.motors',
  'heat.supply.powerW',
  'heat.supply.currentA',
  ...['atPretension', 'atPeak'].flatMap((f) => [`loads.motorShaftRadialN.${f}`, `loads.idlerRadialN.${f}`]),
];

function get(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], obj);
}

describe('evaluateDesign', () => {
  it('when the demo designs are listed, then every mechanism has one', () => {
    expect([...new Set(demos.map(([, d]) => d.mechanism))].sort()).toEqual(['cartesian', 'corexy', 'hbot']);
  });

  it('when a demo design lists job points, then the result carries the job with one move per pair of points', () => {
    const withJob = demos.filter(([, d]) => Array.isArray(d.job?.points));
    expect(withJob.length).toBeGreaterThan(0);
    for (const [, d] of withJob) {
      const r = evaluateDesign(d);
      expect(r.job!.moves).toHaveLength(d.job.points.length - 1);
      expect(r.job!.totalS).toBeGreaterThan(0);
    }
  });

  it.each(demos)('when the demo %s is evaluated, then every documented result field is present', (_f, design) => {
    const r = evaluateDesign(design);
    for (const path of FORMAT_FIELDS) expect(get(r, path), path).toBeDefined();
    expect(r.engineVersion).toBe(ENGINE_VERSION);
    expect(r.envelope.directionsDeg).toEqual(Array.from({ length: 360 }, (_, i) => i));
    for (const key of ['accelMaxMPerS2', 'accelAtCruiseMPerS2', 'speedMaxMPerS', 'limitingMotor'] as const)
      expect(r.envelope[key]).toHaveLength(360);
    for (const s of [r.coupling.speedShare, r.coupling.forceShare]) {
      expect(s.a).toHaveLength(360);
      expect(s.b).toHaveLength(360);
    }
    const n = design.map.points;
    expect(r.stiffness.xMm).toHaveLength(n);
    expect(r.stiffness.lowestFrequencyHz).toHaveLength(n);
    expect(r.stiffness.lowestFrequencyHz.every((row) => row.length === n)).toBe(true);
    for (const b of r.belts) {
      expect(Object.keys(b)).toEqual(
        expect.arrayContaining(['id', 'loopLengthMm', 'loopTeeth', 'teethInMesh', 'spans', 'peakPullN', 'tension']),
      );
      expect(Object.keys(b.tension).sort()).toEqual(
        expect.arrayContaining([
          'pretensionN',
          'worstTightN',
          'worstTightAt',
          'worstSlackN',
          'worstSlackAt',
          'tensileAllowableN',
          'peakPullN',
          'toothLoadN',
          'toothAllowableN',
        ]),
      );
      expect(b.tension.tightMapN).toHaveLength(n);
      expect(b.tension.slackMapN.every((row) => row.length === n)).toBe(true);
      expect(b.tension.tensileAllowableN).toBe(design.belt.allowableTensionN);
      for (const s of b.spans) expect(Object.keys(s)).toEqual(expect.arrayContaining(['id', 'lengthMm', 'targetFrequencyHz']));
    }
    for (const p of r.partsList) expect(Object.keys(p).sort()).toEqual(['item', 'quantity', 'spec', 'specParts']);
  });

  it.each(demos)('when the demo %s is evaluated, then every number is finite and nothing is undefined (JSON-safe)', (_f, design) => {
    const walk = (v: unknown, path: string): void => {
      expect(v, path).not.toBeUndefined();
      if (typeof v === 'number') expect(Number.isFinite(v), path).toBe(true);
      else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`));
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
    };
    walk(evaluateDesign(design), 'result');
  });

  it.each(demos)(
    'when the demo %s is evaluated, then the span targets are the pluck frequencies at the pretension (Halliday ch. 16)',
    (_f, design) => {
      const r = evaluateDesign(design);
      for (const b of r.belts) {
        for (const s of b.spans.filter((x) => x.lengthMm > 0)) {
          expect(s.targetFrequencyHz).toBeCloseTo(
            spanFrequencyHz({ tensionN: design.pretensionN, linearMassKgPerM: design.belt.linearMassKgPerM, spanMm: s.lengthMm }),
            9,
          );
        }
      }
    },
  );

  it.each([
    // s = 1/80 mm (common practice: 200 × 16 / (20 × 2 mm) = 80 steps/mm). Hand values: crossed belts move s/√2
    // along 45° per motor microstep, s along an axis (one step of each motor), s/√2 along the diagonal (one motor);
    // cartesian s, s, and s·√2 on the diagonal (one step of each motor).
    ['corexy', 0.0125 / Math.SQRT2, 45, 0.0125, 0.0125 / Math.SQRT2],
    ['hbot', 0.0125 / Math.SQRT2, 45, 0.0125, 0.0125 / Math.SQRT2],
    ['cartesian', 0.0125, 0, 0.0125, 0.0125 * Math.SQRT2],
  ] as const)('when a %s design is evaluated, then its three microstep figures are the hand values', (mech, one, dir, axis, diag) => {
    // Arrange
    const d = defaultDesign(mech);
    // Act
    const r = evaluateDesign(d);
    // Assert
    expect(r.drive.stepsPerMm).toBeCloseTo(80, 12);
    expect(r.drive.fullStepMm).toBeCloseTo(0.2, 12);
    expect(r.drive.microstep.oneMotorMm).toBeCloseTo(one, 12);
    expect(r.drive.microstep.oneMotorDirectionDeg).toBeCloseTo(dir, 9);
    expect(r.drive.microstep.axisMm).toBeCloseTo(axis, 12);
    expect(r.drive.microstep.diagonalMm).toBeCloseTo(diag, 12);
  });

  it('when a crossed-belt design is evaluated, then K is the crossed-belt relation and motor A alone moves along 45°', () => {
    const r = evaluateDesign(defaultDesign('corexy'));
    expect(r.kinematics.matrix).toEqual([
      [1, 1],
      [1, -1],
    ]);
    expect(r.kinematics.singleMotorDirectionDeg.a).toBeCloseTo(45, 9);
  });

  it.each([
    [{ a: 1, b: 1 }, '+X +Y (45°)', '+X −Y (315°)'],
    [{ a: -1, b: 1 }, '−X −Y (225°)', '+X −Y (315°)'],
  ] as const)('when the motor directions are %j, then the sign convention says where +A and +B go', (motorDirection, a, b) => {
    const r = evaluateDesign({ ...defaultDesign('corexy'), motorDirection });
    expect(r.signConvention.a).toContain(a);
    expect(r.signConvention.b).toContain(b);
    expect(r.signConvention.motorDirection).toEqual(motorDirection);
  });

  it('when the design is evaluated, then the parking position is the middle of the travel', () => {
    const r = evaluateDesign(defaultDesign('cartesian'));
    expect(r.parking.xMm).toBeCloseTo(r.travel.xMm / 2, 12);
    expect(r.parking.yMm).toBeCloseTo(r.travel.yMm / 2, 12);
  });

  it('when a torque table is given, then the result says the table was used and the chart follows it', () => {
    const d = defaultDesign('corexy');
    const r = evaluateDesign({
      ...d,
      motor: {
        ...d.motor,
        torqueCurve: [
          { speedRevPerS: 0, torqueNm: 0.3 },
          { speedRevPerS: 10, torqueNm: 0.1 },
        ],
      },
    });
    expect(r.torqueSpeed.source).toBe('table');
    expect(r.torqueSpeed.speedRevPerS[r.torqueSpeed.speedRevPerS.length - 1]).toBeCloseTo(10, 9);
    expect(r.torqueSpeed.torqueNm[0]).toBeCloseTo(0.3, 12);
    expect(r.torqueSpeed.usableTorqueNm[0]).toBeCloseTo(0.3 * d.torqueMargin, 12);
  });

  it('when operating points are listed, then none asks more than the usable torque at its speed', () => {
    const r: DesignResult = evaluateDesign(defaultDesign('hbot'));
    expect(r.torqueSpeed.operatingPoints.length).toBe(12);
    const margin = defaultDesign('hbot').torqueMargin;
    for (const p of r.torqueSpeed.operatingPoints) {
      const i = Math.min(99, Math.floor((p.speedRevPerS / r.torqueSpeed.speedRevPerS[100]) * 100));
      expect(p.torqueNm).toBeLessThanOrEqual(r.torqueSpeed.torqueNm[i] * margin + 1e-9);
    }
  });

  it.each([
    [{ driver: { microsteps: 3, supplyV: 24, currentRmsA: 1.2 } }, 'driver.microsteps'],
    [{ masses: { carriageKg: -1, toolKg: 0.1, gantryKg: 0.4 } }, 'masses.carriageKg'],
    [{ colour: 'red' }, 'colour'],
  ])('when the input has %j, then it throws EngineInputError at %s', (change, path) => {
    try {
      evaluateDesign({ ...defaultDesign('corexy'), ...change });
      expect.unreachable('should throw');
    } catch (e) {
      expect(e).toBeInstanceOf(EngineInputError);
      expect((e as EngineInputError).issues.map((i) => i.path)).toContain(path);
    }
  });
});

describe('evaluateDesign reference spans', () => {
  it.each(['corexy', 'hbot', 'cartesian'] as const)(
    'when a %s design is evaluated, then each belt names its longest fixed-length span to pluck',
    (mech) => {
      const r = evaluateDesign(defaultDesign(mech));
      for (const b of r.belts) {
        const fixed = b.spans.filter((s) => s.fixedLength);
        expect(fixed.length).toBeGreaterThan(0);
        const ref = b.spans.find((s) => s.id === b.referenceSpanId)!;
        expect(ref.fixedLength).toBe(true);
        expect(ref.lengthMm).toBe(Math.max(...fixed.map((s) => s.lengthMm)));
      }
    },
  );

  it('when the carriage moves, then the spans marked fixed keep their length', () => {
    const d = defaultDesign('hbot');
    const r = evaluateDesign(d);
    const moved = beltGeometryAt({ design: d, xMm: 3, yMm: r.travel.yMm - 2 });
    r.belts.forEach((b, i) =>
      b.spans.forEach((s, j) => {
        if (s.fixedLength) expect(moved[i].spans[j].lengthMm).toBeCloseTo(s.lengthMm, 9);
        else expect(Math.abs(moved[i].spans[j].lengthMm - s.lengthMm)).toBeGreaterThan(1);
      }),
    );
  });
});

describe('evaluateDesign robustness', () => {
  it('when designs are drawn over the whole schema range, then every valid one evaluates to finite numbers', () => {
    let valid = 0;
    const bad: string[] = [];
    for (let seed = 1; seed <= 120; seed++) {
      const doc = wideRandomDocument(seed);
      if (!safeParseDesign(doc).ok) continue;
      valid++;
      const walk = (v: unknown, path: string): void => {
        if (v === undefined || (typeof v === 'number' && !Number.isFinite(v))) bad.push(`seed ${seed}: ${path} = ${String(v)}`);
        else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`));
        else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
      };
      walk(evaluateDesign(doc), 'result');
    }
    expect(bad.slice(0, 5)).toEqual([]);
    expect(valid).toBeGreaterThan(60);
  });
});
