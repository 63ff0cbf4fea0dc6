import type { MigrationFn } from 'umzug';
import type { SeedContext } from '../migrator';
import { Part } from '../models';
import { BELT_NOTE, MOTOR_NOTE } from './202612020101-demo-parts';

// The starter shelf's notes once said "from memory"; people now read "typical value" and where it comes from
// (202612020101-demo-parts writes the new words on a fresh database). This rewrites the old words on a database
// seeded before, and leaves every note an admin has changed alone.
const OLD_BELT_NOTE = "Typical values from memory — replace with the belt maker's data.";
const OLD_MOTOR_NOTE = 'Typical values from memory — replace with your datasheet.';
const SOURCE_REWRITES: [string, string][] = [
  ['Other values: typical, from memory.', 'Other values: typical for this size (common practice), not from a datasheet.'],
  ['Values: typical, from memory.', 'Values: typical for this size, not from a datasheet.'],
];

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  await context.sequelize.transaction(async (transaction) => {
    for (const part of await Part.findAll({ transaction })) {
      const data = (typeof part.data === 'string' ? JSON.parse(part.data) : part.data) as Record<string, unknown>;
      const note = part.note === OLD_BELT_NOTE ? BELT_NOTE : part.note === OLD_MOTOR_NOTE ? MOTOR_NOTE : part.note;
      let source = typeof data.source === 'string' ? data.source : null;
      for (const [from, to] of SOURCE_REWRITES) if (source?.endsWith(from)) source = source.slice(0, -from.length) + to;
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
