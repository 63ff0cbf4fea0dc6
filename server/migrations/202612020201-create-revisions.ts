import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// revisions: what a designer submitted for review, frozen. `inputs`, `result` (the full engine output, ~100 kB of
// JSON; MariaDB's default max_allowed_packet of 16 MB leaves ample room), `summary` (a few figures of the result
// for lists), `engine_version` and `fingerprint` never change after the insert; only the review state (`status`,
// who decided, when, why) moves on. A trigger refuses any UPDATE of the frozen columns, so not even a bug in the
// app can rewrite a revision. Revisions go with their design (ON DELETE CASCADE: a design can only be deleted
// while it is a draft or returned), but a revision that has a sheet cannot be deleted (sheets.revision_id RESTRICT).
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'revisions',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      design_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'designs', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      number: { type: DataTypes.INTEGER, allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      inputs: { type: DataTypes.JSON, allowNull: false },
      result: { type: DataTypes.JSON, allowNull: false },
      summary: { type: DataTypes.JSON, allowNull: false },
      engine_version: { type: DataTypes.STRING(32), allowNull: false },
      fingerprint: { type: DataTypes.CHAR(64), allowNull: false },
      author_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      submitted_at: { type: DataTypes.DATE(3), allowNull: false },
      decided_by_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'users', key: 'id' },
        onDelete: 'SET NULL',
        onUpdate: 'CASCADE',
      },
      decided_at: { type: DataTypes.DATE(3), allowNull: true },
      decision_note: { type: DataTypes.TEXT, allowNull: true },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
      updated_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('revisions', ['design_id', 'number'], { name: 'revisions_design_number', unique: true });
  await qi.addIndex('revisions', ['status', 'submitted_at'], { name: 'revisions_status_submitted' });
  await qi.addIndex('revisions', ['author_id'], { name: 'revisions_author_id' });
  await qi.sequelize.query(`
    CREATE TRIGGER revisions_frozen BEFORE UPDATE ON revisions FOR EACH ROW
    BEGIN
      -- BINARY: the columns' collation ignores case, a frozen document must not change even in case.
      IF NOT (NEW.design_id <=> OLD.design_id AND NEW.number <=> OLD.number
              AND BINARY NEW.inputs <=> BINARY OLD.inputs AND BINARY NEW.result <=> BINARY OLD.result
              AND BINARY NEW.summary <=> BINARY OLD.summary
              AND BINARY NEW.engine_version <=> BINARY OLD.engine_version
              AND BINARY NEW.fingerprint <=> BINARY OLD.fingerprint AND NEW.author_id <=> OLD.author_id
              AND NEW.submitted_at <=> OLD.submitted_at) THEN
        SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'A revision is frozen: its inputs, results and fingerprint cannot change.';
      END IF;
    END`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TRIGGER IF EXISTS revisions_frozen');
  await qi.dropTable('revisions');
};
