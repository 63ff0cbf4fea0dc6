import { Op } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { SeedContext } from '../migrator';
import { Part, User, type PartKind } from '../models';
import type { BeltPartInput, MotorPartInput, PulleyPartInput } from '@/contracts';
import { PART_FIELDS } from '../services/parts.service';

// The starter parts shelf. Pitches are the nominal pitches of the named standards; every other number is a
// typical value (remembered, not read from a datasheet) and its note says so in words people read: "typical
// value" and where it comes from — the shelf is a starting point, not a datasheet.

export const BELT_NOTE =
  "Typical values for this belt size (common practice on desktop machines), not a datasheet — replace with the belt maker's data.";
export const MOTOR_NOTE = 'Typical values for this motor size (common practice), not a datasheet — replace with your motor’s datasheet.';

type BeltSeed = Omit<BeltPartInput, 'note'> & { note?: string };
type PulleySeed = Omit<PulleyPartInput, 'note'> & { note?: string };
type MotorSeed = Omit<MotorPartInput, 'note' | 'torqueCurveConditions'> & {
  note?: string;
  torqueCurveConditions?: MotorPartInput['torqueCurveConditions'];
};

/** Belt profiles: pitch from the standard named in `standard`; mass, EA, allowable tension and minimum teeth typical. */
export const DEMO_BELTS: readonly BeltSeed[] = [
  {
    name: 'MXL 6.4 mm',
    profile: 'MXL',
    standard: 'ISO 5296',
    pitchMm: 2.032,
    widthMm: 6.4,
    linearMassKgPerM: 0.006,
    axialStiffnessN: 30000,
    allowableTensionN: 60,
    minPulleyTeeth: 10,
    source: 'Pitch: ISO 5296 (MXL = 0.080 in). Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: 'XL 9.5 mm',
    profile: 'XL',
    standard: 'ISO 5296',
    pitchMm: 5.08,
    widthMm: 9.5,
    linearMassKgPerM: 0.022,
    axialStiffnessN: 90000,
    allowableTensionN: 180,
    minPulleyTeeth: 10,
    source: 'Pitch: ISO 5296 (XL = 0.200 in). Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: 'L 12.7 mm',
    profile: 'L',
    standard: 'ISO 5296',
    pitchMm: 9.525,
    widthMm: 12.7,
    linearMassKgPerM: 0.06,
    axialStiffnessN: 200000,
    allowableTensionN: 450,
    minPulleyTeeth: 12,
    source: 'Pitch: ISO 5296 (L = 0.375 in). Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: 'T2.5 6 mm',
    profile: 'T2.5',
    standard: 'DIN 7721',
    pitchMm: 2.5,
    widthMm: 6,
    linearMassKgPerM: 0.007,
    axialStiffnessN: 40000,
    allowableTensionN: 100,
    minPulleyTeeth: 10,
    source: 'Pitch: DIN 7721. Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: 'T5 10 mm',
    profile: 'T5',
    standard: 'DIN 7721',
    pitchMm: 5,
    widthMm: 10,
    linearMassKgPerM: 0.024,
    axialStiffnessN: 120000,
    allowableTensionN: 400,
    minPulleyTeeth: 10,
    source: 'Pitch: DIN 7721. Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: 'T10 16 mm',
    profile: 'T10',
    standard: 'DIN 7721',
    pitchMm: 10,
    widthMm: 16,
    linearMassKgPerM: 0.07,
    axialStiffnessN: 350000,
    allowableTensionN: 1200,
    minPulleyTeeth: 12,
    source: 'Pitch: DIN 7721. Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: '3M 9 mm',
    profile: '3M',
    standard: 'ISO 13050 (2014/2022 eds.)',
    pitchMm: 3,
    widthMm: 9,
    linearMassKgPerM: 0.022,
    axialStiffnessN: 80000,
    allowableTensionN: 250,
    minPulleyTeeth: 12,
    source:
      'Pitch: ISO 13050 (curvilinear profiles, 2014 and 2022 editions). Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: '5M 15 mm',
    profile: '5M',
    standard: 'ISO 13050 (2014/2022 eds.)',
    pitchMm: 5,
    widthMm: 15,
    linearMassKgPerM: 0.06,
    axialStiffnessN: 220000,
    allowableTensionN: 600,
    minPulleyTeeth: 14,
    source:
      'Pitch: ISO 13050 (curvilinear profiles, 2014 and 2022 editions). Other values: typical for this size (common practice), not from a datasheet.',
  },
  {
    name: '2 mm round tooth 6 mm',
    profile: '2 mm round tooth',
    standard: 'common practice',
    pitchMm: 2,
    widthMm: 6,
    linearMassKgPerM: 0.0075,
    axialStiffnessN: 40000,
    allowableTensionN: 250,
    minPulleyTeeth: 12,
    source: 'Common practice on desktop machines (glass-fibre cords). Values: typical for this size, not from a datasheet.',
  },
  {
    name: '2 mm round tooth 10 mm',
    profile: '2 mm round tooth',
    standard: 'common practice',
    pitchMm: 2,
    widthMm: 10,
    linearMassKgPerM: 0.0125,
    axialStiffnessN: 65000,
    allowableTensionN: 420,
    minPulleyTeeth: 12,
    source: 'Common practice on desktop machines (glass-fibre cords). Values: typical for this size, not from a datasheet.',
  },
  {
    name: '3 mm round tooth 9 mm',
    profile: '3 mm round tooth',
    standard: 'common practice',
    pitchMm: 3,
    widthMm: 9,
    linearMassKgPerM: 0.022,
    axialStiffnessN: 80000,
    allowableTensionN: 450,
    minPulleyTeeth: 14,
    source: 'Common practice on desktop machines. Values: typical for this size, not from a datasheet.',
  },
];

const PULLEY_NOTE = 'Generic size; inertia left empty so the engine estimates it from the pitch diameter.';

/** Pulleys: drive pulleys for the common motor shafts, a toothed and a smooth idler. */
export const DEMO_PULLEYS: readonly PulleySeed[] = [
  {
    name: '16T drive, 2 mm round tooth, 5 mm bore',
    teeth: 16,
    pitchMm: 2,
    profile: '2 mm round tooth',
    kind: 'drive',
    boreMm: 5,
    inertiaKgM2: null,
  },
  {
    name: '20T drive, 2 mm round tooth, 5 mm bore',
    teeth: 20,
    pitchMm: 2,
    profile: '2 mm round tooth',
    kind: 'drive',
    boreMm: 5,
    inertiaKgM2: null,
  },
  {
    name: '36T drive, 2 mm round tooth, 8 mm bore',
    teeth: 36,
    pitchMm: 2,
    profile: '2 mm round tooth',
    kind: 'drive',
    boreMm: 8,
    inertiaKgM2: null,
  },
  {
    name: '20T drive, 3 mm round tooth, 8 mm bore',
    teeth: 20,
    pitchMm: 3,
    profile: '3 mm round tooth',
    kind: 'drive',
    boreMm: 8,
    inertiaKgM2: null,
  },
  {
    name: '20T toothed idler, 2 mm round tooth, 5 mm bore',
    teeth: 20,
    pitchMm: 2,
    profile: '2 mm round tooth',
    kind: 'idler-toothed',
    boreMm: 5,
    inertiaKgM2: null,
  },
  {
    name: 'Smooth idler for 2 mm pitch, 20T equivalent, 5 mm bore',
    teeth: 20,
    pitchMm: 2,
    profile: '2 mm round tooth',
    kind: 'idler-smooth',
    boreMm: 5,
    inertiaKgM2: null,
    note: 'A smooth idler has no teeth: "teeth" gives its running diameter as the tooth count of a pulley of the same pitch circle (here 12.7 mm).',
  },
];

/** Generic steppers: 42 mm frame (1.8° and 0.9°, short and long stack) and 57 mm frame. */
export const DEMO_MOTORS: readonly MotorSeed[] = [
  {
    name: '42 mm 1.8° short stack (34 mm body)',
    frameMm: 42,
    stepAngleDeg: 1.8,
    holdingTorqueNm: 0.28,
    ratedCurrentA: 1.3,
    phaseResistanceOhm: 2.1,
    phaseInductanceMh: 4.0,
    rotorInertiaKgM2: 3.4e-6,
    massKg: 0.23,
    torqueCurve: null,
  },
  {
    name: '42 mm 1.8° long stack (48 mm body)',
    frameMm: 42,
    stepAngleDeg: 1.8,
    holdingTorqueNm: 0.52,
    ratedCurrentA: 1.7,
    phaseResistanceOhm: 1.5,
    phaseInductanceMh: 2.8,
    rotorInertiaKgM2: 6.8e-6,
    massKg: 0.35,
    torqueCurve: null,
  },
  {
    name: '42 mm 0.9° short stack (40 mm body)',
    frameMm: 42,
    stepAngleDeg: 0.9,
    holdingTorqueNm: 0.36,
    ratedCurrentA: 1.5,
    phaseResistanceOhm: 1.8,
    phaseInductanceMh: 4.4,
    rotorInertiaKgM2: 5.4e-6,
    massKg: 0.28,
    torqueCurve: null,
  },
  {
    name: '42 mm 0.9° long stack (48 mm body)',
    frameMm: 42,
    stepAngleDeg: 0.9,
    holdingTorqueNm: 0.44,
    ratedCurrentA: 1.68,
    phaseResistanceOhm: 1.65,
    phaseInductanceMh: 4.1,
    rotorInertiaKgM2: 6.8e-6,
    massKg: 0.34,
    torqueCurve: null,
  },
  {
    name: '57 mm 1.8° (56 mm body)',
    frameMm: 57,
    stepAngleDeg: 1.8,
    holdingTorqueNm: 1.26,
    ratedCurrentA: 2.8,
    phaseResistanceOhm: 0.9,
    phaseInductanceMh: 2.5,
    rotorInertiaKgM2: 2.8e-5,
    massKg: 0.7,
    torqueCurve: null,
  },
  {
    name: '57 mm 1.8° long stack (76 mm body)',
    frameMm: 57,
    stepAngleDeg: 1.8,
    holdingTorqueNm: 1.89,
    ratedCurrentA: 3.0,
    phaseResistanceOhm: 1.0,
    phaseInductanceMh: 3.6,
    rotorInertiaKgM2: 4.8e-5,
    massKg: 1.0,
    torqueCurve: null,
  },
];

const SHELF: Array<{ kind: PartKind; rows: readonly Record<string, unknown>[]; note: string }> = [
  { kind: 'belt', rows: DEMO_BELTS, note: BELT_NOTE },
  { kind: 'pulley', rows: DEMO_PULLEYS, note: PULLEY_NOTE },
  { kind: 'motor', rows: DEMO_MOTORS, note: MOTOR_NOTE },
];

// A part with the same name already on the shelf (added by hand) is left alone.
export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const admin = await User.findOne({ where: { email: 'admin@example.test' } });
  await context.sequelize.transaction(async (transaction) => {
    for (const { kind, rows, note } of SHELF) {
      for (const row of rows) {
        const data = Object.fromEntries(PART_FIELDS[kind].map((key) => [key, row[key] ?? null]));
        const name = String(row.name);
        await Part.findOrCreate({
          where: { kind, name },
          defaults: {
            kind,
            name,
            data,
            note: String(row.note ?? note),
            retired: false,
            createdById: admin?.id ?? null,
            updatedById: admin?.id ?? null,
          },
          transaction,
        });
      }
    }
  });
};

export const down: MigrationFn<SeedContext> = async () => {
  for (const { kind, rows } of SHELF) {
    await Part.destroy({ where: { kind, name: { [Op.in]: rows.map((r) => String(r.name)) } } });
  }
};
