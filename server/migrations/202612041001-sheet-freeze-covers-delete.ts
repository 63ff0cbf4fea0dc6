import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';
import { createSheetFreezeTriggers } from './sheetFreeze';

// A published sheet refused UPDATE only: DELETE and REPLACE INTO (delete + insert) could still swap an approved PDF's
// bytes. Both triggers are (re)created here by the schema owner, so their definer is the owner and the application's
// account, which may only SELECT/INSERT/UPDATE/DELETE, cannot drop them.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await createSheetFreezeTriggers(qi.sequelize);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TRIGGER IF EXISTS sheets_undeletable');
};
