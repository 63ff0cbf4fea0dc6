import { z } from 'zod';
import { EngineInputError, type InputIssue } from './errors';
import { frameToTravel, travelIssues, type TravelInfo } from './frame';
import type { Mechanism } from './types';

// Ranges are "sane", not physical limits: wide enough for any bench-top or workshop stage, narrow enough
// that a typo (mm entered as m, a sign slip) is caught at the field instead of producing absurd results.

const num = (min: number, max: number, what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, { message: `${what} must be finite` })
    .refine((v) => v >= min, { message: `${what} must be at least ${min}` })
    .refine((v) => v <= max, { message: `${what} must be at most ${max}` });

const pos = (max: number, what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, { message: `${what} must be finite` })
    .refine((v) => v > 0, { message: `${what} must be greater than 0` })
    .refine((v) => v <= max, { message: `${what} must be at most ${max}` });

const int = (min: number, max: number, what: string) =>
  num(min, max, what).refine(Number.isInteger, { message: `${what} must be a whole number` });

/** Microstep settings drivers offer: powers of two from 1 (full step) to 256. */
export const MICROSTEP_OPTIONS = [1, 2, 4, 8, 16, 32, 64, 128, 256] as const;

const torquePointSchema = z.strictObject({
  speedRevPerS: num(0, 1000, 'speed'),
  torqueNm: num(0, 100, 'torque'),
});

const frameSchema = z.strictObject({
  outerXMm: pos(10000, 'outer X size'),
  outerYMm: pos(10000, 'outer Y size'),
  extrusionMm: pos(200, 'extrusion size'),
  carriageXMm: pos(2000, 'carriage X size'),
  carriageYMm: pos(2000, 'carriage Y size'),
  gantryYMm: pos(1000, 'gantry depth'),
  clearanceMm: num(0, 500, 'clearance').default(5),
});

const beltSchema = z.strictObject({
  // The finest synchronous-belt pitches in use are about 1 mm; a near-zero pitch would surface later as a
  // confusing frame-size error, so it is refused here, at its own field.
  pitchMm: num(0.5, 50, 'belt pitch'),
  widthMm: pos(500, 'belt width'),
  linearMassKgPerM: pos(10, 'belt linear mass'),
  axialStiffnessN: pos(1e8, 'belt axial stiffness EA'),
  allowableTensionN: pos(1e6, 'allowable tension'),
  minPulleyTeeth: int(1, 500, 'minimum pulley teeth').default(12),
  /** Allowable load per tooth in mesh; null → the typical value of {@link typicalToothAllowableN}. */
  toothAllowableN: pos(100000, 'allowable load per tooth').nullable().default(null),
});

/** Y guides of the gantry (docs/models/racking.md). */
const guideSchema = z.strictObject({
  /** Rated moment of the Y guides about the vertical axis; null → {@link TYPICAL_YAW_MOMENT_RATING_NM}. */
  yawMomentRatingNm: pos(100000, 'guide yaw moment rating').nullable().default(null),
});

const pulleySchema = z.strictObject({
  driveTeeth: int(6, 500, 'drive pulley teeth'),
  idlerTeeth: int(6, 500, 'idler teeth'),
  /** Drive pulley inertia; null → estimated as a solid aluminium cylinder (see mass.ts). */
  driveInertiaKgM2: num(0, 1, 'drive pulley inertia').nullable().default(null),
  /** Idler inertia; null → estimated as a solid aluminium cylinder (see mass.ts). */
  idlerInertiaKgM2: num(0, 1, 'idler inertia').nullable().default(null),
  /** Eccentricity of the drive pulley's pitch circle on the shaft (error budget; typical value 0.02 mm). */
  runoutMm: num(0, 5, 'drive pulley runout').default(0.02),
});

/** Most points a job may list (typed or uploaded). */
export const JOB_MAX_POINTS = 1000;

// Second-layer inputs (docs/models/): each group is optional and fills in from typical values, so design files
// written before they existed stay valid.

/** Gantry beam section; a null field takes the typical value of the frame's extrusion size (structuralModes.ts). */
const gantryBeamSchema = z.strictObject({
  secondMomentMm4: pos(1e10, 'gantry beam second moment of area').nullable().default(null),
  modulusGPa: pos(1000, 'gantry beam modulus').nullable().default(null),
  massKgPerM: pos(1000, 'gantry beam mass per metre').nullable().default(null),
});

/** The motion controller: its step-rate limit per motor and the jerk its planner uses (null: none). */
const controllerSchema = z.strictObject({
  maxStepRateHz: pos(1e8, 'controller step rate limit').default(100000),
  jerkMmPerS3: pos(1e12, 'controller jerk').nullable().default(null),
});

/** Cartesian stages with one Y motor: the solid round shaft that carries its turn to the far side. */
const crossShaftSchema = z.strictObject({
  diameterMm: pos(100, 'cross shaft diameter').default(8),
  shearModulusGPa: pos(500, 'cross shaft shear modulus').default(79.3),
});

/** Ratings the radial loads on motor shafts and idlers are checked against (typical values as defaults). */
const radialLoadRatingSchema = z.strictObject({
  motorShaftN: pos(1e6, 'motor shaft radial load rating').default(75),
  idlerN: pos(1e6, 'idler radial load rating').default(200),
});

const jobPointSchema = z.strictObject({
  xMm: num(-10000, 10000, 'job point X'),
  yMm: num(-10000, 10000, 'job point Y'),
  dwellS: num(0, 3600, 'job point dwell').default(0),
});

/** A placement job: XY points in travel coordinates, each with the pause after arriving. */
const jobSchema = z.strictObject({
  points: z.array(jobPointSchema).max(JOB_MAX_POINTS, `a job may have at most ${JOB_MAX_POINTS} points`),
});

/** Step angles of three- and five-phase hybrids (60°/N_r, 36°/N_r with 50 or 100 rotor teeth): refused. */
const MULTI_PHASE_STEP_ANGLES_DEG = [1.2, 0.6, 0.72, 0.36] as const;

/**
 * True for a step angle a two-phase hybrid or permanent-magnet stepper can have: 90°/N_r with a whole number of
 * rotor teeth (or pole pairs) N_r, and not one of the usual three- or five-phase angles, which the torque model
 * does not cover (docs/models/motor-torque.md §1).
 * @param stepAngleDeg - full-step angle [°]
 * @returns whether the motor is modelled
 */
export function isTwoPhaseStepAngle(stepAngleDeg: number): boolean {
  const nr = 90 / stepAngleDeg;
  if (Math.abs(nr - Math.round(nr)) > 1e-6 * nr) return false;
  return !MULTI_PHASE_STEP_ANGLES_DEG.some((a) => Math.abs(stepAngleDeg - a) < 1e-9);
}

const stepAngleSchema = num(0.1, 15, 'step angle').refine(isTwoPhaseStepAngle, {
  message:
    'step angle must be that of a two-phase motor, 90° divided by a whole number of rotor teeth (1.8°, 0.9°, 3.6°, 7.5°, 15° …); ' +
    'three- and five-phase angles such as 1.2° or 0.72° are not modelled',
});

const motorSchema = z
  .strictObject({
    stepAngleDeg: stepAngleSchema,
    holdingTorqueNm: pos(100, 'holding torque'),
    ratedCurrentA: pos(50, 'rated current'),
    phaseResistanceOhm: num(0, 1000, 'phase resistance'),
    phaseInductanceMh: num(0, 10000, 'phase inductance'),
    rotorInertiaKgM2: num(0, 1, 'rotor inertia'),
    massKg: num(0, 100, 'motor mass'),
    torqueCurve: z.array(torquePointSchema).min(2).max(500).nullable().default(null),
    /**
     * Supply voltage and driver current the torque table was measured at (a table measured at another supply or
     * current does not describe this drive; a check warns); null = not recorded.
     */
    torqueCurveConditions: z
      .strictObject({ supplyV: pos(1000, 'torque table supply voltage'), currentRmsA: pos(50, 'torque table driver current') })
      .nullable()
      .default(null),
    /** Highest shaft speed the builder allows (bearings, pulley rating); null = no limit beyond the torque. */
    maxSpeedRevPerS: pos(1000, 'speed limit').nullable().default(null),
  })
  .superRefine((m, ctx) => {
    const curve = m.torqueCurve;
    if (!curve) return;
    // A motor with no torque at standstill cannot hold the carriage: the stiffness model would have no spring.
    if (!(curve[0].torqueNm > 0)) {
      ctx.addIssue({
        code: 'custom',
        path: ['torqueCurve', 0, 'torqueNm'],
        message: 'the first torque of the table must be greater than 0',
      });
    }
    for (let i = 1; i < curve.length; i++) {
      if (!(curve[i].speedRevPerS > curve[i - 1].speedRevPerS)) {
        ctx.addIssue({
          code: 'custom',
          path: ['torqueCurve', i, 'speedRevPerS'],
          message: 'torque curve speeds must increase from row to row',
        });
      }
    }
  });

const driverSchema = z.strictObject({
  microsteps: z.number({ error: 'microsteps must be a number' }).refine((v) => (MICROSTEP_OPTIONS as readonly number[]).includes(v), {
    message: `microsteps must be a power of two from 1 to 256 (${MICROSTEP_OPTIONS.join(', ')})`,
  }),
  supplyV: pos(1000, 'supply voltage'),
  currentRmsA: pos(50, 'driver RMS current'),
});

const massesSchema = z.strictObject({
  carriageKg: pos(500, 'carriage mass'),
  toolKg: num(0, 500, 'tool mass'),
  gantryKg: num(0, 500, 'gantry mass'),
});

const sign = z.union([z.literal(1), z.literal(-1)], { error: 'motor direction must be 1 or -1' });

/**
 * zod schema of one design document (src/engine/README.md). Strict: unknown fields are rejected with their path.
 * Optional fields and their defaults: description "", motorDirection {a:1,b:1}, yMotors 1,
 * frame.clearanceMm 5, belt.minPulleyTeeth 12, belt.toothAllowableN null (typical value), pulley.*InertiaKgM2 null
 * (estimated), guide.yawMomentRatingNm null (typical value), motor.torqueCurve null,
 * motor.maxSpeedRevPerS null, frictionN {x:0,y:0}, torqueMargin 0.6, toolMount null, map {points:41},
 * ringingToleranceMm 0.02, plannedAccelMmPerS2 null (the envelope's worst direction), wantedTravel null,
 * pulley.runoutMm 0.02, gantryBeam {all null: typical for the frame's extrusion size}, controller
 * {maxStepRateHz 100000, jerkMmPerS3 null}, crossShaft {diameterMm 8, shearModulusGPa 79.3 (steel)},
 * radialLoadRating {motorShaftN 75, idlerN 200}, job null (see docs/models/ for each).
 * Cross-field rule: yMotors 2 only for "cartesian". The frame must leave travel (checked by {@link parseDesign}).
 * @see docs/README.md (the models) and src/engine/README.md (the design document)
 */
export const designInputSchema = z
  .strictObject({
    schemaVersion: z.literal(1, { error: 'schemaVersion must be 1' }).default(1),
    name: z.string().trim().min(1, 'name must not be empty').max(200, 'name must be at most 200 characters'),
    /** Free text; the demo designs use it to say their numbers are invented. */
    description: z.string().max(4000, 'description must be at most 4000 characters').default(''),
    mechanism: z.enum(['corexy', 'hbot', 'cartesian'], { error: 'mechanism must be one of corexy, hbot, cartesian' }),
    /**
     * Which way is +A / +B: 1 keeps the relation of docs/models/envelope.md §1 (crossed belts: +A moves the carriage toward
     * +X+Y, +B toward +X−Y; cartesian: +A → +X, +B → +Y); −1 when that motor is wired the other way round.
     */
    motorDirection: z.strictObject({ a: sign, b: sign }).default({ a: 1, b: 1 }),
    /** Cartesian only: Y driven by one motor through a cross shaft (1) or by two synchronised motors (2). */
    yMotors: z.union([z.literal(1), z.literal(2)], { error: 'yMotors must be 1 or 2' }).default(1),
    frame: frameSchema,
    belt: beltSchema,
    pulley: pulleySchema,
    motor: motorSchema,
    driver: driverSchema,
    masses: massesSchema,
    frictionN: z.strictObject({ x: num(0, 10000, 'X friction'), y: num(0, 10000, 'Y friction') }).default({ x: 0, y: 0 }),
    pretensionN: pos(100000, 'pretension'),
    torqueMargin: pos(1, 'torque margin').default(0.6),
    cruiseSpeedMmPerS: pos(100000, 'cruise speed'),
    guide: guideSchema.default({ yawMomentRatingNm: null }),
    toolMount: z
      .strictObject({ holdN: pos(100000, 'tool mount hold force') })
      .nullable()
      .default(null),
    map: z.strictObject({ points: int(2, 101, 'map points') }).default({ points: 41 }),
    ringingToleranceMm: pos(100, 'ringing tolerance').default(0.02),
    /** Acceleration the designer means to use; null → the envelope's worst-direction limit. */
    plannedAccelMmPerS2: pos(1e7, 'planned acceleration').nullable().default(null),
    /** Travel the designer needs; when set, the travel check fails if the frame gives less. */
    wantedTravel: z
      .strictObject({ xMm: pos(10000, 'wanted X travel'), yMm: pos(10000, 'wanted Y travel') })
      .nullable()
      .default(null),
    gantryBeam: gantryBeamSchema.default({ secondMomentMm4: null, modulusGPa: null, massKgPerM: null }),
    controller: controllerSchema.default({ maxStepRateHz: 100000, jerkMmPerS3: null }),
    crossShaft: crossShaftSchema.default({ diameterMm: 8, shearModulusGPa: 79.3 }),
    radialLoadRating: radialLoadRatingSchema.default({ motorShaftN: 75, idlerN: 200 }),
    /** Optional placement job (points in travel coordinates); null when the design has none. */
    job: jobSchema.nullable().default(null),
  })
  .superRefine((d, ctx) => {
    if (d.yMotors === 2 && d.mechanism !== 'cartesian') {
      ctx.addIssue({ code: 'custom', path: ['yMotors'], message: 'two Y motors exist only in the cartesian mechanism' });
    }
  });

/** A design as written in a file (optional fields may be missing). */
export type DesignInputRaw = z.input<typeof designInputSchema>;
/** A validated design with every default filled in. */
export type DesignInput = z.output<typeof designInputSchema>;

function toPath(path: readonly PropertyKey[]): string {
  return path.map((p) => String(p)).join('.');
}

/**
 * Turns zod issues into {path, message} pairs; an unknown key is reported at its own path ("frame.colour").
 * @param error - a zod error
 * @returns issues with dotted paths
 */
export function issuesFromZod(error: z.ZodError): InputIssue[] {
  const out: InputIssue[] = [];
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) {
        out.push({ path: toPath([...issue.path, key]), message: `unknown field "${key}"` });
      }
    } else if (issue.code === 'invalid_type' && issue.input === undefined) {
      out.push({ path: toPath(issue.path), message: 'is required' });
    } else {
      out.push({ path: toPath(issue.path), message: issue.message });
    }
  }
  return out;
}

/**
 * Validates a design without throwing.
 * @param input - any JSON value
 * @returns `{ ok: true, value }` with defaults filled in, or `{ ok: false, issues }` naming each bad field
 */
export function safeParseDesign(input: unknown): { ok: true; value: DesignInput } | { ok: false; issues: InputIssue[] } {
  const r = safeParseWithTravel(input);
  return r.ok ? { ok: true, value: r.value } : r;
}

/** The schema pass, then the travel check on the belt layout, keeping the travel it worked out. */
function safeParseWithTravel(input: unknown): { ok: true; value: DesignInput; travel: TravelInfo } | { ok: false; issues: InputIssue[] } {
  // reportInput lets issuesFromZod tell a missing field ("is required") from a value of the wrong type.
  const r = designInputSchema.safeParse(input, { reportInput: true });
  if (!r.success) return { ok: false, issues: issuesFromZod(r.error) };
  // Travel depends on the belt layout, so it is checked after the field rules have passed.
  const travel = frameToTravel(r.data);
  const extra = travelIssues(r.data, travel);
  if (extra.length > 0) return { ok: false, issues: extra };
  return { ok: true, value: r.data, travel };
}

/**
 * Validates a design and fills in the defaults.
 * @param input - any JSON value
 * @returns the validated design
 * @throws EngineInputError with `issues: {path, message}[]` (e.g. path "driver.microsteps")
 */
export function parseDesign(input: unknown): DesignInput {
  return parseDesignWithTravel(input).design;
}

/**
 * Same as {@link parseDesign}, also returning the travel and belt layout the validation worked out
 * (frameToTravel of the design), so an evaluation builds them once.
 * @param input - any JSON value
 * @returns the validated design and its travel
 * @throws EngineInputError as parseDesign
 */
export function parseDesignWithTravel(input: unknown): { design: DesignInput; travel: TravelInfo } {
  const r = safeParseWithTravel(input);
  if (!r.ok) {
    const summary = r.issues.map((i) => (i.path ? `${i.path}: ${i.message}` : i.message)).join('; ');
    throw new EngineInputError('parseDesign', summary, r.issues);
  }
  return { design: r.value, travel: r.travel };
}

/**
 * A sensible bench-top starting point for "new design from a template": 460 mm square frame of 20 mm
 * extrusion, 2 mm pitch × 6 mm belt, 20-tooth pulleys, a 1.8° motor of 0.45 N·m on 24 V, 3 m/s² planned.
 * The numbers are a generic starting point, not the data of any product.
 * @param mechanism - "corexy" | "hbot" | "cartesian"
 * @returns a complete, valid design document (defaults written out)
 */
export function defaultDesign(mechanism: Mechanism): DesignInput {
  const names: Record<Mechanism, string> = {
    corexy: 'New crossed-belt stage',
    hbot: 'New H-belt stage',
    cartesian: 'New cartesian stage',
  };
  return parseDesign({
    schemaVersion: 1,
    name: names[mechanism],
    description: '',
    mechanism,
    motorDirection: { a: 1, b: 1 },
    yMotors: 1,
    frame: { outerXMm: 460, outerYMm: 460, extrusionMm: 20, carriageXMm: 60, carriageYMm: 50, gantryYMm: 40, clearanceMm: 5 },
    belt: {
      pitchMm: 2,
      widthMm: 6,
      linearMassKgPerM: 0.0075,
      axialStiffnessN: 40000,
      allowableTensionN: 250,
      minPulleyTeeth: 12,
      toothAllowableN: null,
    },
    pulley: { driveTeeth: 20, idlerTeeth: 20, driveInertiaKgM2: null, idlerInertiaKgM2: null, runoutMm: 0.02 },
    motor: {
      stepAngleDeg: 1.8,
      holdingTorqueNm: 0.45,
      ratedCurrentA: 1.5,
      phaseResistanceOhm: 1.8,
      phaseInductanceMh: 3.2,
      rotorInertiaKgM2: 5.7e-6,
      massKg: 0.28,
      torqueCurve: null,
      maxSpeedRevPerS: null,
    },
    driver: { microsteps: 16, supplyV: 24, currentRmsA: 1.2 },
    masses: { carriageKg: 0.3, toolKg: 0.1, gantryKg: mechanism === 'cartesian' ? 0.5 : 0.45 },
    frictionN: { x: 2, y: 3 },
    guide: { yawMomentRatingNm: null },
    pretensionN: 40,
    torqueMargin: 0.6,
    cruiseSpeedMmPerS: 300,
    toolMount: null,
    map: { points: 41 },
    ringingToleranceMm: 0.02,
    // A moderate planned acceleration: the motors give far more, but belt ringing sets the practical limit.
    plannedAccelMmPerS2: 3000,
    wantedTravel: null,
    gantryBeam: { secondMomentMm4: null, modulusGPa: null, massKgPerM: null },
    controller: { maxStepRateHz: 100000, jerkMmPerS3: null },
    crossShaft: { diameterMm: 8, shearModulusGPa: 79.3 },
    radialLoadRating: { motorShaftN: 75, idlerN: 200 },
    job: null,
  });
}
