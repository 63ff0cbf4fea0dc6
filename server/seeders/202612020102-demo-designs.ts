import { Op } from 'sequelize';
import type { MigrationFn } from 'umzug';
import { defaultDesign, parseDesign, type DesignInput, type Mechanism } from '@/engine';
import type { SeedContext } from '../migrator';
import { Design, User } from '../models';
import { computeStoredResults } from '../services/designs.service';
import { DEMO_WORKSHOP } from './demoAccounts';

// Demo designs of the invented workshop, all seeded as drafts; the review seeder moves some of them on
// (submits, approves, returns). It finds them by owner e-mail and the names in DEMO_DESIGNS.

const DESCRIPTION = `Invented demo data of the ${DEMO_WORKSHOP}; the numbers are illustrative, not a product's data.`;

/** One demo design: who owns it and how it differs from the engine's template for its mechanism. */
type DemoDesign = { ownerEmail: string; name: string; mechanism: Mechanism; edit: (d: DesignInput) => Partial<DesignInput> };

/** The demo designs, by name (unique per owner). Other seeders refer to them through these names. */
export const DEMO_DESIGNS: readonly DemoDesign[] = [
  {
    ownerEmail: 'designer@example.test',
    name: 'Bench dispensing stage',
    mechanism: 'corexy',
    edit: (d) => ({
      frame: { ...d.frame, outerXMm: 470, outerYMm: 420 },
      masses: { carriageKg: 0.35, toolKg: 0.25, gantryKg: 0.45 },
      cruiseSpeedMmPerS: 200,
      plannedAccelMmPerS2: 3000,
      pretensionN: 45,
      wantedTravel: { xMm: 300, yMm: 260 },
    }),
  },
  {
    ownerEmail: 'designer@example.test',
    name: 'A3 pen plotter',
    mechanism: 'hbot',
    edit: (d) => ({
      frame: { ...d.frame, outerXMm: 560, outerYMm: 420, carriageXMm: 50, carriageYMm: 40 },
      masses: { carriageKg: 0.15, toolKg: 0.05, gantryKg: 0.35 },
      cruiseSpeedMmPerS: 400,
      plannedAccelMmPerS2: 5000,
      ringingToleranceMm: 0.05,
      // Two small rail carriages; the yaw rating the designer took from the rail maker's sheet (an invented demo figure).
      guide: { yawMomentRatingNm: 6 },
    }),
  },
  {
    ownerEmail: 'designer@example.test',
    name: 'Label placer',
    mechanism: 'cartesian',
    edit: (d) => ({
      frame: { ...d.frame, outerXMm: 400, outerYMm: 360 },
      masses: { carriageKg: 0.3, toolKg: 0.15, gantryKg: 0.5 },
      cruiseSpeedMmPerS: 250,
      plannedAccelMmPerS2: 3000,
    }),
  },
  {
    ownerEmail: 'designer2@example.test',
    name: 'Wide dispensing stage',
    mechanism: 'corexy',
    edit: (d) => ({
      frame: { ...d.frame, outerXMm: 640, outerYMm: 480, extrusionMm: 30 },
      belt: {
        pitchMm: 3,
        widthMm: 9,
        linearMassKgPerM: 0.022,
        axialStiffnessN: 80000,
        allowableTensionN: 450,
        minPulleyTeeth: 14,
        toothAllowableN: 22,
      },
      motor: {
        ...d.motor,
        holdingTorqueNm: 1.26,
        ratedCurrentA: 2.8,
        phaseResistanceOhm: 0.9,
        phaseInductanceMh: 2.5,
        rotorInertiaKgM2: 2.8e-5,
        massKg: 0.7,
      },
      driver: { microsteps: 16, supplyV: 36, currentRmsA: 2.0 },
      masses: { carriageKg: 0.6, toolKg: 0.4, gantryKg: 0.9 },
      pretensionN: 60,
      cruiseSpeedMmPerS: 250,
      plannedAccelMmPerS2: 2500,
    }),
  },
  {
    ownerEmail: 'designer2@example.test',
    name: 'Sample tray picker',
    mechanism: 'corexy',
    edit: (d) => ({
      frame: { ...d.frame, outerXMm: 360, outerYMm: 360 },
      masses: { carriageKg: 0.25, toolKg: 0.12, gantryKg: 0.35 },
      driver: { ...d.driver, microsteps: 32 },
      cruiseSpeedMmPerS: 300,
      plannedAccelMmPerS2: 5000,
    }),
  },
];

/** The validated design document of a demo design. */
export function demoDesignDocument(demo: DemoDesign): DesignInput {
  const base = defaultDesign(demo.mechanism);
  return parseDesign({ ...base, ...demo.edit(base), name: demo.name, description: DESCRIPTION });
}

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const emails = [...new Set(DEMO_DESIGNS.map((d) => d.ownerEmail))];
  const owners = await User.findAll({ where: { email: { [Op.in]: emails } } });
  const byEmail = new Map(owners.map((u) => [u.email, u]));
  const missing = emails.filter((e) => !byEmail.has(e));
  if (missing.length) throw new Error(`demo designs need the demo users ${missing.join(', ')} (seeder 202612020001-demo-users)`);

  await context.sequelize.transaction(async (transaction) => {
    for (const demo of DEMO_DESIGNS) {
      const owner = byEmail.get(demo.ownerEmail)!;
      const inputs = demoDesignDocument(demo);
      await Design.findOrCreate({
        where: { ownerId: owner.id, name: demo.name },
        defaults: {
          name: demo.name,
          mechanism: inputs.mechanism,
          status: 'draft',
          ownerId: owner.id,
          updatedById: owner.id,
          inputs: inputs as unknown as Record<string, unknown>,
          ...computeStoredResults(inputs),
          version: 1,
        },
        transaction,
      });
    }
  });
};

export const down: MigrationFn<SeedContext> = async () => {
  const owners = await User.findAll({ where: { email: { [Op.in]: DEMO_DESIGNS.map((d) => d.ownerEmail) } } });
  const ids = new Map(owners.map((u) => [u.email, u.id]));
  for (const demo of DEMO_DESIGNS) {
    const ownerId = ids.get(demo.ownerEmail);
    if (ownerId !== undefined) await Design.destroy({ where: { ownerId, name: demo.name } });
  }
};
