import { Op } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { DesignInput, DesignResult } from '@/engine';
import type { SeedContext } from '../migrator';
import { AuditLog, Measurement, Revision, Sheet, User } from '../models';
import { tensionFigures } from '../services/measurements.service';

// A maker typed a pluck that reads twice the target of a reference span (the second harmonic rang loudest), so a
// fresh start shows the hint beside it: "this may be the second harmonic; pluck again before changing the tension".
const HOUR = 3_600_000;
const json = <T>(v: unknown): T => (typeof v === 'string' ? JSON.parse(v) : v) as T;

/** The sheet, belt and reference span the harmonic reading belongs to, and the frequency typed. */
async function target() {
  // The newest sheet that already has measurements (the demo's current Bench sheet).
  const measured = await Measurement.findAll({ attributes: ['sheetId'], group: ['sheetId'] });
  const sheet = (await Sheet.findOne({
    where: { id: { [Op.in]: measured.map((m) => m.sheetId) } },
    include: [{ model: Revision, as: 'revision', attributes: ['inputs', 'result'] }],
    order: [['approvedAt', 'DESC']],
  })) as (Sheet & { revision?: Revision }) | null;
  if (!sheet?.revision) return;
  const inputs = json<DesignInput>(sheet.revision.inputs);
  const result = json<DesignResult>(sheet.revision.result);
  const belt = result.belts[result.belts.length - 1];
  const span = belt?.spans.find((s) => s.id === belt.referenceSpanId);
  if (!span) return;
  return { sheet, inputs, belt, span, frequencyHz: Number((2 * span.targetFrequencyHz * 1.004).toFixed(1)) };
}

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const maker = await User.findOne({ where: { email: 'maker@example.test' } });
  const found = maker ? await target() : null;
  if (!maker || !found) return;
  const { sheet, inputs, belt, span, frequencyHz } = found;
  const figures = tensionFigures({ span, linearMassKgPerM: inputs.belt.linearMassKgPerM, frequencyHz });
  const measuredAt = new Date(Date.now() - HOUR);
  await context.sequelize.transaction(async (transaction) => {
    await Measurement.create(
      {
        sheetId: sheet.id,
        spanId: span.id,
        beltId: belt.id,
        spanLengthMm: span.lengthMm,
        linearMassKgPerM: inputs.belt.linearMassKgPerM,
        frequencyHz,
        ...figures,
        targetFrequencyHz: span.targetFrequencyHz,
        source: 'typed',
        confidence: null,
        spectrum: null,
        recordingSha256: null,
        recordingSize: null,
        recordingName: null,
        measuredById: maker.id,
        measuredAt,
      },
      { transaction },
    );
    await AuditLog.create(
      {
        actorId: maker.id,
        action: 'measurement.create',
        entity: 'sheet',
        entityId: sheet.id,
        fromState: null,
        toState: 'typed',
        reason: `${span.id}: ${frequencyHz.toFixed(2)} Hz → ${figures.tensionN.toFixed(1)} N`,
        createdAt: measuredAt,
      },
      { transaction },
    );
  });
};

export const down: MigrationFn<SeedContext> = async () => {
  const found = await target();
  if (!found) return;
  await Measurement.destroy({ where: { sheetId: found.sheet.id, spanId: found.span.id, frequencyHz: found.frequencyHz, source: 'typed' } });
};
