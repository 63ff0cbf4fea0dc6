import { describe, expect, it } from 'vitest';
import {
  EngineInputError,
  JOB_MAX_POINTS,
  MICROSTEP_OPTIONS,
  defaultDesign,
  designInputSchema,
  parseDesign,
  safeParseDesign,
  type Mechanism,
} from '@/engine';

const MECHS: Mechanism[] = ['corexy', 'hbot', 'cartesian'];

/** A design document with one field replaced (dotted path) or removed (value undefined). */
function withField(path: string, value: unknown, mech: Mechanism = 'corexy'): Record<string, unknown> {
  const doc = JSON.parse(JSON.stringify(defaultDesign(mech))) as Record<string, unknown>;
  const parts = path.split('.');
  let node = doc as Record<string, unknown>;
  for (const p of parts.slice(0, -1)) node = node[p] as Record<string, unknown>;
  if (value === undefined) delete node[parts[parts.length - 1]];
  else node[parts[parts.length - 1]] = value;
  return doc;
}

function issuePaths(input: unknown): string[] {
  const r = safeParseDesign(input);
  return r.ok ? [] : r.issues.map((i) => i.path);
}

describe('defaultDesign', () => {
  it.each(MECHS)('when asked for a %s template, then it is a valid design of that mechanism', (mech) => {
    const d = defaultDesign(mech);
    expect(d.mechanism).toBe(mech);
    expect(parseDesign(JSON.parse(JSON.stringify(d)))).toEqual(d);
  });
});

describe('parseDesign', () => {
  it.each([
    ['colour', 'red', 'colour'],
    ['frame.colour', 'red', 'frame.colour'],
    ['motor.brand', 'x', 'motor.brand'],
  ])('when the unknown field %s is present, then the error names its path', (path, value, expected) => {
    expect(issuePaths(withField(path, value))).toEqual([expected]);
  });

  it.each([
    ['driver.microsteps', 3],
    ['driver.microsteps', 512],
    ['driver.microsteps', 0],
    ['masses.carriageKg', -0.3],
    ['masses.toolKg', -1],
    ['pulley.driveTeeth', 0],
    ['pulley.idlerTeeth', 12.5],
    ['belt.pitchMm', -2],
    ['map.points', 102],
    ['map.points', 1],
    ['torqueMargin', 1.2],
    ['driver.supplyV', Number.NaN],
    ['cruiseSpeedMmPerS', '300'],
    ['mechanism', 'delta'],
    ['motorDirection.a', 2],
  ])('when %s is %s, then the design is rejected at that path', (path, value) => {
    expect(issuePaths(withField(path, value))).toContain(path);
  });

  it('when microsteps is 3, then parseDesign throws EngineInputError naming driver.microsteps', () => {
    // Arrange
    const doc = withField('driver.microsteps', 3);
    // Act
    const call = () => parseDesign(doc);
    // Assert
    expect(call).toThrow(EngineInputError);
    try {
      call();
    } catch (e) {
      const err = e as EngineInputError;
      expect(err.message.startsWith('[parseDesign] driver.microsteps:')).toBe(true);
      expect(err.issues[0].path).toBe('driver.microsteps');
      expect(err.issues[0].message).toMatch(/power of two/);
    }
  });

  it.each(MICROSTEP_OPTIONS.map((m) => [m]))('when microsteps is %i, then it is accepted', (m) => {
    expect(issuePaths(withField('driver.microsteps', m))).toEqual([]);
  });

  it.each([2, 101])('when map.points is %i, then it is accepted', (n) => {
    expect(issuePaths(withField('map.points', n))).toEqual([]);
  });

  it('when a required field is missing, then its path is named as required', () => {
    const r = safeParseDesign(withField('belt.pitchMm', undefined));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues).toEqual([{ path: 'belt.pitchMm', message: 'is required' }]);
  });

  // fix: zod 4 leaves `input` off issues unless asked, so every wrong type read as "is required".
  it('when a number field holds letters, then the message says it must be a number, not that it is missing', () => {
    const r = safeParseDesign(withField('frame.outerXMm', 'abc'));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.issues).toHaveLength(1);
      expect(r.issues[0].path).toBe('frame.outerXMm');
      expect(r.issues[0].message).toMatch(/must be a number/);
    }
  });

  // fix: a vanishing pitch used to pass and be reported against the frame size instead.
  it('when the belt pitch is vanishingly small, then the error names belt.pitchMm', () => {
    expect(issuePaths(withField('belt.pitchMm', 1e-300))).toEqual(['belt.pitchMm']);
  });

  it('when optional fields are left out, then the documented defaults are applied', () => {
    // Arrange
    const doc = withField('torqueMargin', undefined);
    for (const p of [
      'description',
      'motorDirection',
      'yMotors',
      'frictionN',
      'toolMount',
      'map',
      'ringingToleranceMm',
      'plannedAccelMmPerS2',
      'wantedTravel',
      'schemaVersion',
      'guide',
    ]) {
      delete doc[p];
    }
    delete (doc.frame as Record<string, unknown>).clearanceMm;
    delete (doc.belt as Record<string, unknown>).minPulleyTeeth;
    delete (doc.belt as Record<string, unknown>).toothAllowableN;
    delete (doc.motor as Record<string, unknown>).torqueCurve;
    delete (doc.motor as Record<string, unknown>).maxSpeedRevPerS;
    delete (doc.pulley as Record<string, unknown>).driveInertiaKgM2;
    // Act
    const d = parseDesign(doc);
    // Assert
    expect(d).toMatchObject({
      schemaVersion: 1,
      description: '',
      motorDirection: { a: 1, b: 1 },
      yMotors: 1,
      frictionN: { x: 0, y: 0 },
      torqueMargin: 0.6,
      toolMount: null,
      map: { points: 41 },
      ringingToleranceMm: 0.02,
      plannedAccelMmPerS2: null,
      wantedTravel: null,
    });
    expect(d.frame.clearanceMm).toBe(5);
    expect(d.belt.minPulleyTeeth).toBe(12);
    expect(d.motor.torqueCurve).toBeNull();
    expect(d.motor.maxSpeedRevPerS).toBeNull();
    expect(d.pulley.driveInertiaKgM2).toBeNull();
    expect(d.belt.toothAllowableN).toBeNull();
    expect(d.guide).toEqual({ yawMomentRatingNm: null });
  });

  it.each([1.8, 0.9, 3.6, 7.5, 15, 0.45, 3.75])('when the step angle is %d° (two-phase), then it is accepted', (deg) => {
    expect(issuePaths(withField('motor.stepAngleDeg', deg))).toEqual([]);
  });

  it.each([1.2, 0.72, 0.6, 0.36, 1.7, 2.2])(
    'when the step angle is %d° (not a two-phase motor), then motor.stepAngleDeg is refused with a clear message',
    (deg) => {
      // Arrange / Act
      const r = safeParseDesign(withField('motor.stepAngleDeg', deg));
      // Assert
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.issues.map((i) => i.path)).toEqual(['motor.stepAngleDeg']);
        expect(r.issues[0].message).toMatch(/two-phase/);
      }
    },
  );

  it.each([
    ['belt.toothAllowableN', -1],
    ['guide.yawMomentRatingNm', 0],
  ])('when %s is %d, then that field is named', (path, value) => {
    expect(issuePaths(withField(path, value))).toEqual([path]);
  });

  it('when two Y motors are asked for crossed belts, then yMotors is rejected', () => {
    expect(issuePaths(withField('yMotors', 2, 'corexy'))).toEqual(['yMotors']);
    expect(issuePaths(withField('yMotors', 2, 'cartesian'))).toEqual([]);
  });

  it('when torque-curve speeds do not increase, then the offending row is named', () => {
    const doc = withField('motor.torqueCurve', [
      { speedRevPerS: 0, torqueNm: 0.4 },
      { speedRevPerS: 5, torqueNm: 0.3 },
      { speedRevPerS: 5, torqueNm: 0.2 },
    ]);
    expect(issuePaths(doc)).toEqual(['motor.torqueCurve.2.speedRevPerS']);
  });

  it.each([
    ['frame.outerXMm', 120],
    ['frame.outerYMm', 90],
  ])('when %s is %i mm, too small for the carriage and pulleys, then the frame size is named', (path, value) => {
    const r = safeParseDesign(withField(path, value));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.issues.map((i) => i.path)).toContain(path);
      expect(r.issues[0].message).toMatch(/no [XY] travel/);
    }
  });

  it('when the document is not an object, then the root is named', () => {
    expect(issuePaths('not a design')).toEqual(['']);
    expect(issuePaths(null)).toEqual(['']);
  });
});

describe('designInputSchema', () => {
  it('when the schema is used directly, then it is the same rule set parseDesign applies before the travel rule', () => {
    expect(designInputSchema.safeParse(withField('driver.microsteps', 3)).success).toBe(false);
    expect(designInputSchema.safeParse(defaultDesign('hbot')).success).toBe(true);
  });
});

describe('parseDesign (second-layer inputs)', () => {
  it('when a design file predates the second-layer groups, then it stays valid and gets their documented defaults', () => {
    // Arrange: the document as written before pulley.runoutMm, gantryBeam, controller, crossShaft, radialLoadRating, job
    const doc = JSON.parse(JSON.stringify(defaultDesign('corexy'))) as Record<string, unknown>;
    for (const key of ['gantryBeam', 'controller', 'crossShaft', 'radialLoadRating', 'job']) delete doc[key];
    delete (doc.pulley as Record<string, unknown>).runoutMm;
    // Act
    const d = parseDesign(doc);
    // Assert
    expect(d.pulley.runoutMm).toBe(0.02);
    expect(d.gantryBeam).toEqual({ secondMomentMm4: null, modulusGPa: null, massKgPerM: null });
    expect(d.controller).toEqual({ maxStepRateHz: 100000, jerkMmPerS3: null });
    expect(d.crossShaft).toEqual({ diameterMm: 8, shearModulusGPa: 79.3 });
    expect(d.radialLoadRating).toEqual({ motorShaftN: 75, idlerN: 200 });
    expect(d.job).toBeNull();
  });

  it.each([
    ['pulley.runoutMm', -0.01],
    ['pulley.runoutMm', 6],
    ['gantryBeam.secondMomentMm4', 0],
    ['gantryBeam.modulusGPa', -69],
    ['controller.maxStepRateHz', 0],
    ['controller.jerkMmPerS3', 'fast'],
    ['crossShaft.diameterMm', 0],
    ['radialLoadRating.motorShaftN', -28],
    ['radialLoadRating.idlerN', Number.POSITIVE_INFINITY],
  ])('when %s is %j, then the error names that field', (path, value) => {
    expect(issuePaths(withField(path, value))).toEqual([path]);
  });

  it('when a job point has a bad coordinate, a negative dwell or an unknown field, then each error names the point and field', () => {
    // Arrange
    const doc = withField('job', {
      points: [
        { xMm: 10, yMm: 10 },
        { xMm: 'ten', yMm: 10 },
        { xMm: 10, yMm: 10, dwellS: -1 },
        { xMm: 10, yMm: 10, zMm: 3 },
      ],
    });
    // Act / Assert
    expect(issuePaths(doc)).toEqual(['job.points.1.xMm', 'job.points.2.dwellS', 'job.points.3.zMm']);
  });

  it('when a job lists more points than allowed, then the error names job.points', () => {
    const points = Array.from({ length: JOB_MAX_POINTS + 1 }, (_, i) => ({ xMm: i % 100, yMm: 0 }));
    expect(issuePaths(withField('job', { points }))).toEqual(['job.points']);
  });

  it('when a job is valid, then dwell defaults to 0 and the points keep their order', () => {
    const d = parseDesign(
      withField('job', {
        points: [
          { xMm: 5, yMm: 6, dwellS: 0.2 },
          { xMm: 7, yMm: 8 },
        ],
      }),
    );
    expect(d.job?.points).toEqual([
      { xMm: 5, yMm: 6, dwellS: 0.2 },
      { xMm: 7, yMm: 8, dwellS: 0 },
    ]);
  });
});
