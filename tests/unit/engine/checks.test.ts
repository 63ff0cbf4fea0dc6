import { describe, expect, it } from 'vitest';
import { designChecks, renderQuantity, teethInMeshFactor, type BeltReport, type Check, type CheckInput } from '@/engine';

const place = { xMm: 10, yMm: 20, directionDeg: 90 };
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
  tension: {
    pretensionN: 40,
    worstTightN: 68,
    worstTightAt: place,
    worstSlackN: 14,
    worstSlackAt: place,
    tensileAllowableN: 250,
    peakPullN: 30,
    toothLoadN: 5,
    toothAllowableN: 12,
    toothAllowableIsTypical: false,
    countedTeeth: 6,
    tightMapN: [[68]],
    slackMapN: [[14]],
  },
};
const withTension = (t: Partial<BeltReport['tension']>, extra: Partial<BeltReport> = {}): BeltReport[] => [
  { ...belt, ...extra, tension: { ...belt.tension, ...t } },
];

const base: CheckInput = {
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
  worstAccelDirectionDeg: 45,
  cruiseSpeedMPerS: 0.3,
  worstSpeedMPerS: 0.5,
  worstSpeedDirectionDeg: 45,
  travel: { xMm: 300, yMm: 300 },
  outer: { xMm: 460, yMm: 460 },
  wantedTravel: { xMm: 250, yMm: 250 },
  toolKg: 0.1,
  toolHoldN: 1,
  toolAccelMPerS2: 3,
  racking: { momentNm: 2, ratingNm: 10, ratingIsTypical: true },
};

function find(checks: Check[], id: string, subject?: string): Check {
  const c = checks.find((x) => x.id === id && (subject === undefined || x.subject === subject));
  if (!c) throw new Error(`no check ${id} ${subject ?? ''}`);
  return c;
}

describe('designChecks', () => {
  it('when every number is comfortable, then every check is ok and has the shared shape', () => {
    // Arrange / Act
    const checks = designChecks(base);
    // Assert
    expect(checks.filter((c) => c.severity !== 'ok')).toEqual([]);
    for (const c of checks) {
      expect(Object.keys(c).sort()).toEqual(['id', 'kind', 'limit', 'message', 'parts', 'severity', 'subject', 'unit', 'value']);
      expect(c.message).toBe(c.parts.map((p) => (typeof p === 'string' ? p : renderQuantity(p))).join(''));
    }
  });

  it('when messages are written, then they name no internal id, path or element id', () => {
    // Arrange
    const bad = designChecks({ ...base, currentRmsA: 3, belts: withTension({ worstSlackN: -2, worstTightN: 300, toothLoadN: 20 }) });
    // Act
    const text = bad.map((c) => c.message).join('\n');
    // Assert: no check id, no dotted input path, no layout element id
    for (const c of bad) expect(text).not.toContain(`${c.id}:`);
    expect(text).not.toMatch(/\b[a-z]+\.[a-z]+[A-Z][A-Za-z]*\b/);
    expect(text).not.toMatch(/A\.motor|clampRight|belt-slack/);
  });

  it.each([
    // common practice: keep a stepper at or below 50–70 % of its pull-out torque
    ['torque-margin', undefined, { torqueMargin: 0.8 }, 'warn'],
    ['driver-current', undefined, { currentRmsA: 1.8 }, 'warn'],
    ['pulley-min-teeth', undefined, { driveTeeth: 10 }, 'fail'],
    // belt makers' common practice: ≥ 6 teeth in mesh; below 3 our judgement says fail
    ['teeth-in-mesh', 'Belt A', { belts: [{ ...belt, teethInMesh: 5.99 }] }, 'warn'],
    ['teeth-in-mesh', 'Belt A', { belts: [{ ...belt, teethInMesh: 2.5 }] }, 'fail'],
    ['teeth-in-mesh', 'Belt A', { belts: [{ ...belt, teethInMesh: 6 }] }, 'ok'],
    ['belt-tensile', 'Belt A', { belts: withTension({ worstTightN: 210 }) }, 'warn'],
    ['belt-tensile', 'Belt A', { belts: withTension({ worstTightN: 260 }) }, 'fail'],
    ['belt-slack', 'Belt A', { belts: withTension({ worstSlackN: 0 }) }, 'fail'],
    ['belt-slack', 'Belt A', { belts: withTension({ worstSlackN: 0.5 }) }, 'ok'],
    ['belt-ratcheting', 'Belt A', { belts: withTension({ worstSlackN: 9 }) }, 'warn'],
    ['belt-tooth-load', 'Belt A', { belts: withTension({ toothLoadN: 10 }) }, 'warn'],
    ['belt-tooth-load', 'Belt A', { belts: withTension({ toothLoadN: 12.5 }) }, 'fail'],
    ['belt-tooth-load', 'Belt A', { belts: withTension({ countedTeeth: 0 }) }, 'fail'],
    ['racking', 'Y guides', { racking: { momentNm: 8.5, ratingNm: 10, ratingIsTypical: false } }, 'warn'],
    ['racking', 'Y guides', { racking: { momentNm: 11, ratingNm: 10, ratingIsTypical: false } }, 'fail'],
    ['resonance', undefined, { ringingPlanned: { accelMPerS2: 10, amplitudeMm: 0.05, accelForToleranceMPerS2: 4 } }, 'warn'],
    ['resonance', undefined, { ringingPlanned: { accelMPerS2: 50, amplitudeMm: 0.2, accelForToleranceMPerS2: 4 } }, 'fail'],
    // judged against the worst direction: fail above it, warn within 10 %
    ['planned-acceleration', undefined, { plannedAccelMPerS2: 18.5 }, 'warn'],
    ['planned-acceleration', undefined, { plannedAccelMPerS2: 20.5 }, 'fail'],
    ['planned-acceleration', undefined, { plannedAccelMPerS2: 17.9 }, 'ok'],
    ['cruise-speed', undefined, { cruiseSpeedMPerS: 0.46 }, 'warn'],
    ['cruise-speed', undefined, { cruiseSpeedMPerS: 0.51 }, 'fail'],
    ['cruise-speed', undefined, { worstSpeedMPerS: 0 }, 'fail'],
    ['travel-wanted', 'X travel', { wantedTravel: { xMm: 310, yMm: 250 } }, 'fail'],
    ['travel-vs-frame', undefined, { travel: { xMm: 300, yMm: 200 } }, 'warn'],
    ['tool-mount-hold', undefined, { toolHoldN: 0.25 }, 'fail'],
    ['tool-mount-hold', undefined, { toolHoldN: 0.4 }, 'warn'],
    ['tool-mount-release', undefined, { toolHoldN: 2 }, 'warn'],
  ] as const)('when %s (%s) meets %j, then its severity is %s', (id, subject, change, severity) => {
    // Arrange
    const input = { ...base, ...change } as CheckInput;
    // Act
    const c = find(designChecks(input), id, subject);
    // Assert
    expect(c.severity).toBe(severity);
  });

  it('when the slack side goes slack, then the message says where and the pretension that would keep it taut', () => {
    // Arrange
    const input = { ...base, belts: withTension({ worstSlackN: -6, worstSlackAt: { xMm: 0, yMm: 300, directionDeg: 270 } }) };
    // Act
    const c = find(designChecks(input), 'belt-slack', 'Belt A');
    // Assert
    expect(c.message).toBe(
      'Belt A: the slack side goes slack (−6 N) at X 0 mm, Y 300 mm, moving toward 270°; raise the Belt pretension above 46 N or lower the pull.',
    );
    expect(c.parts).toContainEqual({ value: -6, kind: 'forceN' });
    expect(c.kind).toBe('forceN');
  });

  it('when the tooth allowable is the typical value, then the message says so', () => {
    // Arrange
    const input = { ...base, belts: withTension({ toothAllowableIsTypical: true }) };
    // Act
    const c = find(designChecks(input), 'belt-tooth-load', 'Belt A');
    // Assert
    expect(c.message).toContain('typical value');
  });

  it('when no tool mount, wanted travel, planned acceleration or racking applies, then those checks are left out', () => {
    // Arrange / Act
    const ids = designChecks({ ...base, toolHoldN: null, wantedTravel: null, plannedAccelMPerS2: null, racking: null }).map((c) => c.id);
    // Assert
    expect(ids).not.toContain('tool-mount-hold');
    expect(ids).not.toContain('travel-wanted');
    expect(ids).not.toContain('planned-acceleration');
    expect(ids).not.toContain('racking');
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
