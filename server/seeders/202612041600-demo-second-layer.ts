import { Op, type Transaction } from 'sequelize';
import type { MigrationFn } from 'umzug';
import { evaluateDesign, parseDesign, type DesignInput } from '@/engine';
import { getConfig } from '../config';
import type { SeedContext } from '../migrator';
import { Attachment, AuditLog, Design, User } from '../models';
import { computeStoredResults } from '../services/designs.service';
import { parseJobCsv, removeBytes, storeBytes } from '../uploads';

// Second-layer inputs for the demo workshop's editable designs, so a fresh start shows the error budget, the modes,
// excitation, heat, shaft loads and a job populated (docs/models/):
//   Sample tray picker (draft)  a 50-point pick-and-place job (25 samples from a tray to a rack), uploaded as a CSV kept
//                               with the design; a 20 × 40 mm gantry beam typed in; a 32-bit controller with a jerk
//   A3 pen plotter (returned)   an older controller (60 kHz step limit) and a looser pulley (0.03 mm runout)
// Designs in review or approved keep their frozen inputs. All numbers are invented demo data.

const PICKER = 'Sample tray picker';
const PLOTTER = 'A3 pen plotter';
const JOB_FILE = 'tray-to-rack-job.csv';

/**
 * The demo job as CSV: 25 samples picked from a 5 × 5 tray on the left of the travel and placed in a 5 × 5 rack on
 * the right, 50 points with a pause to grip (0.3 s) and to release (0.4 s).
 * @param travel - usable travel of the design [mm]
 */
export function demoJobCsv(travel: { xMm: number; yMm: number }): string {
  const round = (v: number) => Math.round(v * 10) / 10;
  const lines = ['# Demo job: 25 samples from a 5 x 5 tray (left) to a 5 x 5 rack (right); invented data', 'x_mm,y_mm,dwell_s'];
  for (let i = 0; i < 25; i++) {
    const col = i % 5;
    const row = Math.floor(i / 5);
    const y = round(travel.yMm * (0.12 + 0.19 * row));
    lines.push(`${round(travel.xMm * (0.06 + 0.08 * col))},${y},0.3`);
    lines.push(`${round(travel.xMm * (0.6 + 0.08 * col))},${round(travel.yMm * (0.9 - 0.19 * row))},0.4`);
  }
  return `${lines.join('\n')}\n`;
}

async function findDemo(name: string, email: string): Promise<{ design: Design; owner: User } | null> {
  const owner = await User.findOne({ where: { email } });
  if (!owner) return null;
  const design = await Design.findOne({ where: { name, ownerId: owner.id } });
  return design ? { design, owner } : null;
}

const inputsOf = (d: Design): DesignInput => parseDesign(typeof d.inputs === 'string' ? JSON.parse(d.inputs) : d.inputs);

async function save(design: Design, inputs: DesignInput, actor: User, reason: string, transaction: Transaction): Promise<void> {
  await Design.update(
    {
      inputs: inputs as unknown as Record<string, unknown>,
      ...computeStoredResults(inputs),
      version: design.version + 1,
      updatedById: actor.id,
    },
    { where: { id: design.id }, transaction },
  );
  await AuditLog.create({ actorId: actor.id, action: 'design.job_upload', entity: 'design', entityId: design.id, reason }, { transaction });
}

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const root = getConfig().uploadDir;
  const picker = await findDemo(PICKER, 'designer2@example.test');
  const plotter = await findDemo(PLOTTER, 'designer@example.test');
  let stored: string | null = null;
  try {
    await context.sequelize.transaction(async (transaction) => {
      if (picker && ['draft', 'returned'].includes(picker.design.status)) {
        const base = inputsOf(picker.design);
        const travel = evaluateDesign({ ...base, map: { points: 2 } }).travel;
        const csv = demoJobCsv(travel);
        const table = parseJobCsv(csv);
        const inputs = parseDesign({
          ...base,
          gantryBeam: { secondMomentMm4: 46000, modulusGPa: 69, massKgPerM: 0.85 },
          controller: { maxStepRateHz: 200000, jerkMmPerS3: 200000 },
          pulley: { ...base.pulley, runoutMm: 0.015 },
          job: { points: table.points },
        });
        const bytes = Buffer.from(csv, 'utf8');
        const { sha256, size } = await storeBytes(root, bytes);
        stored = sha256;
        await Attachment.create(
          { designId: picker.design.id, partId: null, uploadedById: picker.owner.id, fileName: JOB_FILE, mime: 'text/csv', size, sha256 },
          { transaction },
        );
        await save(
          picker.design,
          inputs,
          picker.owner,
          `${JOB_FILE}: ${table.points.length} points (x mm, y mm, dwell s), SHA-256 ${sha256}`,
          transaction,
        );
      }
      if (plotter && ['draft', 'returned'].includes(plotter.design.status)) {
        const base = inputsOf(plotter.design);
        const inputs = parseDesign({
          ...base,
          controller: { maxStepRateHz: 60000, jerkMmPerS3: null },
          pulley: { ...base.pulley, runoutMm: 0.03 },
        });
        await Design.update(
          {
            inputs: inputs as unknown as Record<string, unknown>,
            ...computeStoredResults(inputs),
            version: plotter.design.version + 1,
            updatedById: plotter.owner.id,
          },
          { where: { id: plotter.design.id }, transaction },
        );
      }
    });
  } catch (err) {
    if (stored && (await Attachment.count({ where: { sha256: stored } })) === 0) await removeBytes(root, stored);
    throw err;
  }
};

export const down: MigrationFn<SeedContext> = async ({ context }) => {
  const root = getConfig().uploadDir;
  const picker = await findDemo(PICKER, 'designer2@example.test');
  const plotter = await findDemo(PLOTTER, 'designer@example.test');
  const hashes: string[] = [];
  await context.sequelize.transaction(async (transaction) => {
    for (const found of [picker, plotter]) {
      if (!found) continue;
      const base = inputsOf(found.design);
      const inputs = parseDesign({
        ...base,
        gantryBeam: { secondMomentMm4: null, modulusGPa: null, massKgPerM: null },
        controller: { maxStepRateHz: 100000, jerkMmPerS3: null },
        pulley: { ...base.pulley, runoutMm: 0.02 },
        job: null,
      });
      await Design.update(
        { inputs: inputs as unknown as Record<string, unknown>, ...computeStoredResults(inputs) },
        { where: { id: found.design.id, status: { [Op.in]: ['draft', 'returned'] } }, transaction },
      );
    }
    if (picker) {
      const rows = await Attachment.findAll({ where: { designId: picker.design.id, fileName: JOB_FILE }, transaction });
      rows.forEach((r) => hashes.push(r.sha256));
      await Attachment.destroy({ where: { id: { [Op.in]: rows.map((r) => r.id).concat(0) } }, transaction });
      await AuditLog.destroy({ where: { entity: 'design', entityId: picker.design.id, action: 'design.job_upload' }, transaction });
    }
  });
  for (const sha256 of hashes) if ((await Attachment.count({ where: { sha256 } })) === 0) await removeBytes(root, sha256);
};
