import type { MigrationFn } from 'umzug';
import type { SeedContext } from '../migrator';
import { Part } from '../models';
import { BELT_NOTE, MOTOR_NOTE } from './202612020101-demo-parts';

// The starter shelf's first notes did not say where their typical values come from; people now read "typical value"
// and its source (202612020101-demo-parts writes the new words on a fresh database). This rewrites the first words on
// a database seeded before, recognised by their fixed shape, and leaves every note an admin has changed alone.
const OLD_BELT_NOTE = /^Typical values [a-z]+ [a-z]+ — replace with the belt maker's data\.$/;
const OLD_MOTOR_NOTE = /^Typical values [a-z]+ [a-z]+ — replace with your datasheet\.$/;
const SOURCE_REWRITES: [RegExp, string][] = [
  [/Other values: typical, [a-z]+ [a-z]+\.$/, 'Other values: typical for this size (common practice), not from a datasheet.'],
  [/(?<!Other )Values: typical, [a-z]+ [a-z]+\.$/, 'Values: typical for this size, not from a datasheet.'],
];

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  await context.sequelize.transaction(async (transaction) => {
    for (const part of await Part.findAll({ transaction })) {
      const data = (typeof part.data === 'string' ? JSON.parse(part.data) : part.data) as Record<string, unknown>;
      const old = part.note ?? '';
      const note = OLD_BELT_NOTE.test(old) ? BELT_NOTE : OLD_MOTOR_NOTE.test(old) ? MOTOR_NOTE : part.note;
      let source = typeof data.source === 'string' ? data.source : null;
      for (const [from, to] of SOURCE_REWRITES) if (source !== null && from.test(source)) source = source.replace(from, to);
      if (note === part.note && source === data.source) continue;
      part.note = note;
      if (source !== null) {
        part.data = { ...data, source };
        part.changed('data', true);
      }
      await part.save({ transaction, silent: true });
    }
  });
};

// The old words are not brought back: they were the defect.
export const down: MigrationFn<SeedContext> = async () => {};
