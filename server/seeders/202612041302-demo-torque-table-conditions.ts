import type { MigrationFn } from 'umzug';
import { parseDesign } from '@/engine';
import type { SeedContext } from '../migrator';
import { Design, Part, User } from '../models';
import { computeStoredResults } from '../services/designs.service';
import { TORQUE_MOTOR } from './202612020301-demo-uploads';

// The demo shelf motor's torque table was measured at 24 V and 1.7 A (its CSV says so in a comment); the shelf now
// records that. The draft "Sample tray picker" then picks this motor with its table while its driver runs 1.2 A, so a
// fresh start shows the Design desk's warning that the table describes another drive.
const MEASURED_AT = { supplyV: 24, currentRmsA: 1.7 };
const DESIGN = 'Sample tray picker';
const MOTOR_KEYS = [
  'stepAngleDeg',
  'holdingTorqueNm',
  'ratedCurrentA',
  'phaseResistanceOhm',
  'phaseInductanceMh',
  'rotorInertiaKgM2',
  'massKg',
];

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  await context.sequelize.transaction(async (transaction) => {
    const motor = await Part.findOne({ where: { kind: 'motor', name: TORQUE_MOTOR }, transaction });
    if (!motor) return; // the shelf was changed by hand
    const data = (typeof motor.data === 'string' ? JSON.parse(motor.data) : motor.data) as Record<string, unknown>;
    if (!Array.isArray(data.torqueCurve) || data.torqueCurve.length === 0) return;
    motor.data = { ...data, torqueCurveConditions: MEASURED_AT };
    motor.changed('data', true);
    await motor.save({ transaction, silent: true });

    const designer = await User.findOne({ where: { email: 'designer2@example.test' }, transaction });
    const design = designer ? await Design.findOne({ where: { name: DESIGN, ownerId: designer.id, status: 'draft' }, transaction }) : null;
    if (!design) return;
    const inputs = (typeof design.inputs === 'string' ? JSON.parse(design.inputs) : design.inputs) as Record<string, unknown>;
    const motorInputs = { ...(inputs.motor as Record<string, unknown>) };
    for (const key of MOTOR_KEYS) motorInputs[key] = data[key];
    motorInputs.torqueCurve = data.torqueCurve;
    motorInputs.torqueCurveConditions = MEASURED_AT;
    const next = parseDesign({ ...inputs, motor: motorInputs });
    await design.update(
      { inputs: next as unknown as Record<string, unknown>, ...computeStoredResults(next), version: design.version + 1 },
      { transaction },
    );
  });
};

export const down: MigrationFn<SeedContext> = async () => {
  const motor = await Part.findOne({ where: { kind: 'motor', name: TORQUE_MOTOR } });
  if (!motor) return;
  const data = (typeof motor.data === 'string' ? JSON.parse(motor.data) : motor.data) as Record<string, unknown>;
  motor.data = { ...data, torqueCurveConditions: null };
  motor.changed('data', true);
  await motor.save();
};
