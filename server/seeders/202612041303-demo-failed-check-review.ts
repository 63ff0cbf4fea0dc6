import type { MigrationFn } from 'umzug';
import { defaultDesign, parseDesign } from '@/engine';
import type { SeedContext } from '../migrator';
import { AuditLog, Design, Revision, User } from '../models';
import { computeStoredResults } from '../services/designs.service';
import { freezeDesign } from '../services/freezeRevision';

// A revision with a failed check waiting on the Review desk, so a fresh start shows how it stands out (counts on the
// row, the approve dialog listing it, a justification required to approve): a fast pick-and-place head planned at
// 60 m/s², where the carriage rings far beyond its tolerance at the weakest point.
const NAME = 'Fast pick-and-place head';
const HOUR = 3_600_000;

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const designer = await User.findOne({ where: { email: 'designer@example.test' } });
  if (!designer) throw new Error('the failed-check demo needs designer@example.test (seeder 202612020001-demo-users)');
  if (await Design.findOne({ where: { name: NAME, ownerId: designer.id } })) return;
  const base = defaultDesign('corexy');
  const inputs = parseDesign({
    ...base,
    name: NAME,
    description: 'Places small parts from a tray; wants short moves at high acceleration.',
    frame: { ...base.frame, outerXMm: 400, outerYMm: 300 },
    masses: { carriageKg: 0.2, toolKg: 0.05, gantryKg: 0.3 },
    plannedAccelMmPerS2: 60000,
    cruiseSpeedMmPerS: 400,
  });
  const frozen = freezeDesign(inputs);
  const at = new Date(Date.now() - 5 * HOUR);
  await context.sequelize.transaction(async (transaction) => {
    const design = await Design.create(
      {
        name: NAME,
        mechanism: inputs.mechanism,
        status: 'in_review',
        ownerId: designer.id,
        updatedById: designer.id,
        inputs: inputs as unknown as Record<string, unknown>,
        ...computeStoredResults(inputs),
        version: 1,
      },
      { transaction },
    );
    const revision = await Revision.create(
      {
        designId: design.id,
        number: 1,
        status: 'in_review',
        inputs: frozen.inputs as unknown as Record<string, unknown>,
        result: frozen.result as unknown as Record<string, unknown>,
        summary: frozen.summary,
        engineVersion: frozen.result.engineVersion,
        fingerprint: frozen.fingerprint,
        authorId: designer.id,
        submittedAt: at,
        decidedById: null,
        decidedAt: null,
        decisionNote: null,
        sheetUnits: 'metric',
        createdAt: at,
        updatedAt: at,
      },
      { transaction, silent: true },
    );
    await AuditLog.bulkCreate(
      [
        {
          actorId: designer.id,
          action: 'design.submit',
          entity: 'design',
          entityId: design.id,
          fromState: 'draft',
          toState: 'in_review',
          reason: 'Submitted revision 1',
          createdAt: at,
        },
        {
          actorId: designer.id,
          action: 'revision.submit',
          entity: 'revision',
          entityId: revision.id,
          fromState: null,
          toState: 'in_review',
          reason: `Revision 1 of design ${design.id}, fingerprint ${frozen.fingerprint}`,
          createdAt: at,
        },
      ],
      { transaction },
    );
  });
};

export const down: MigrationFn<SeedContext> = async () => {
  const designer = await User.findOne({ where: { email: 'designer@example.test' } });
  const design = designer ? await Design.findOne({ where: { name: NAME, ownerId: designer.id } }) : null;
  if (!design) return;
  await Revision.destroy({ where: { designId: design.id } });
  await design.destroy();
};
