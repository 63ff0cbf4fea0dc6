import { describe, expect, it } from 'vitest';
import { designChecks, teethInMeshFactor, type BeltReport, type Check } from '@/engine';

const belt: BeltReport = {
  id: 'A',
  label: 'belt A',
  loopLengthMm: 1600,
  loopTeeth: 800,
  cutLengthMm: 1630,
  teethInMesh: 10,
  driveWrapDeg: 180,
  spans: [],
  referenceSpanId: null,
  arms: [],
  massKg: 0.012,
  peakPullN: 30,
  tightSideN: 55,
  slackSideN: 25,
  allowableTensionN: 250,
};

const base = {
  torqueMargin: 0.6,
  currentRmsA: 1.2,
  ratedCurrentA: 1.5,
  belts: [belt],
  pretensionN: 40,
  driveTeeth: 20,
  idlerTeeth: 20,
  minPulleyTeeth: 12,
  ringingPlanned: { accelMPerS2: 3, amplitudeMm: 0.01, accelForToleranceMPerS2: 6 },
  ringingToleranceMm: 0.02,
  plannedAccelMPerS2: 3,
  worstAccelMPerS2: 20,
  bestAccelMPerS2: 40,
  cruiseSpeedMPerS: 0.3,
  worstSpeedMPerS: 0.5,
  bestSpeedMPerS: 0.7,
  travel: { xMm: 300, yMm: 300 },
  outer: { xMm: 460, yMm: 460 },
  wantedTravel: { xMm: 250, yMm: 250 },
  toolKg: 0.1,
  toolHoldN: 1,
  toolAccelMPerS2: 3,
};

function find(checks: Check[], id: string): Check {
  const c = checks.find((x) => x.id === id);
  if (!c) throw new Error(`no check ${id}`);
  return c;
}

describe('designChecks', () => {
  it('when every number is comfortable, then every check is ok and has the documented shape', () => {
    const checks = designChecks(base);
    expect(checks.every((c) => c.severity === 'ok')).toBe(true);
    for (const c of checks) {
      expect(Object.keys(c).sort()).toEqual(['id', 'limit', 'message', 'severity', 'unit', 'value']);
      expect(c.message.length).toBeGreaterThan(10);
    }
  });

  it.each([
    // common practice: keep a stepper at or below 50–70 % of its pull-out torque
    ['torque-margin', { torqueMargin: 0.8 }, 'warn'],
    ['driver-current', { currentRmsA: 1.8 }, 'warn'],
    ['pulley-min-teeth', { driveTeeth: 10 }, 'fail'],
    // belt makers' common practice: ≥ 6 teeth in mesh; below 3 our judgement says fail
    ['teeth-in-mesh:A', { belts: [{ ...belt, teethInMesh: 5.99 }] }, 'warn'],
    ['teeth-in-mesh:A', { belts: [{ ...belt, teethInMesh: 2.5 }] }, 'fail'],
    ['teeth-in-mesh:A', { belts: [{ ...belt, teethInMesh: 6 }] }, 'ok'],
    ['belt-working-tension:A', { belts: [{ ...belt, tightSideN: 210 }] }, 'warn'],
    ['belt-working-tension:A', { belts: [{ ...belt, tightSideN: 260 }] }, 'fail'],
    // common practice: pretension ≥ half the peak pull keeps the slack side taut
    ['belt-slack-side:A', { belts: [{ ...belt, slackSideN: -1 }] }, 'fail'],
    ['belt-slack-side:A', { belts: [{ ...belt, slackSideN: 5 }] }, 'warn'],
    ['resonance', { ringingPlanned: { accelMPerS2: 10, amplitudeMm: 0.05, accelForToleranceMPerS2: 4 } }, 'warn'],
    ['resonance', { ringingPlanned: { accelMPerS2: 50, amplitudeMm: 0.2, accelForToleranceMPerS2: 4 } }, 'fail'],
    ['planned-acceleration', { plannedAccelMPerS2: 25 }, 'warn'],
    ['planned-acceleration', { plannedAccelMPerS2: 45 }, 'fail'],
    ['cruise-speed', { cruiseSpeedMPerS: 0.6 }, 'warn'],
    ['cruise-speed', { cruiseSpeedMPerS: 0.8 }, 'fail'],
    ['travel-wanted:x', { wantedTravel: { xMm: 310, yMm: 250 } }, 'fail'],
    ['travel-vs-frame', { travel: { xMm: 300, yMm: 200 } }, 'warn'],
    ['tool-mount-hold', { toolHoldN: 0.25 }, 'fail'],
    ['tool-mount-hold', { toolHoldN: 0.4 }, 'warn'],
    ['tool-mount-release', { toolHoldN: 2 }, 'warn'],
  ] as const)('when %s meets %j, then its severity is %s', (id, change, severity) => {
    const c = find(designChecks({ ...base, ...change } as typeof base), id);
    expect(c.severity).toBe(severity);
  });

  it('when no tool mount, wanted travel or planned acceleration is set, then those checks are left out', () => {
    const ids = designChecks({ ...base, toolHoldN: null, wantedTravel: null, plannedAccelMPerS2: null }).map((c) => c.id);
    expect(ids).not.toContain('tool-mount-hold');
    expect(ids).not.toContain('travel-wanted:x');
    expect(ids).not.toContain('planned-acceleration');
    expect(ids).toContain('resonance');
  });
});

describe('teethInMeshFactor', () => {
  it.each([
    // belt makers' literature (common practice): "for each tooth less than 6, you lose 20 % of the rated load"
    [9.46, 1],
    [6, 1],
    [5.5, 0.8],
    [4, 0.6],
    [0.5, 0],
  ])('when %d teeth are in mesh, then the belt keeps %d of its capacity (common practice)', (tim, expected) => {
    expect(teethInMeshFactor(tim)).toBeCloseTo(expected, 12);
  });
});
