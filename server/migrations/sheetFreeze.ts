import type { Sequelize } from 'sequelize';

/**
 * The triggers that keep a published design sheet exactly as it was approved. UPDATE and DELETE are refused, and so
 * is `REPLACE INTO sheets` (MariaDB carries out a replacing row as a DELETE, or an UPDATE, of the old one). Only the
 * schema owner can drop them: the application's account holds no TRIGGER or DROP right (issue 12, item 7).
 * Shared by the migration that installs them and the demo seeder's `down`, which must lift them to unseed.
 */
const MESSAGE = 'A design sheet never changes once published.';

/** Trigger name → the statement it guards. */
export const SHEET_FREEZE_TRIGGERS = { sheets_frozen: 'UPDATE', sheets_undeletable: 'DELETE' } as const;

/** Creates both triggers (as the connected account, which becomes their definer). */
export async function createSheetFreezeTriggers(sequelize: Sequelize): Promise<void> {
  for (const [name, statement] of Object.entries(SHEET_FREEZE_TRIGGERS)) {
    await sequelize.query(`DROP TRIGGER IF EXISTS ${name}`);
    await sequelize.query(
      `CREATE TRIGGER ${name} BEFORE ${statement} ON sheets FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = '${MESSAGE}'`,
    );
  }
}

/** Drops both triggers (only the demo seeder's `down` and migrations do this, as the schema owner). */
export async function dropSheetFreezeTriggers(sequelize: Sequelize): Promise<void> {
  for (const name of Object.keys(SHEET_FREEZE_TRIGGERS)) await sequelize.query(`DROP TRIGGER IF EXISTS ${name}`);
}
