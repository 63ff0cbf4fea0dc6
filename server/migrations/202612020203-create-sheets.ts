import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// sheets: the design sheet published when a revision is approved, one per revision. Both paper sizes are
// rendered at approval and stored as bytes (LONGBLOB; a sheet is ~100 kB, far below MariaDB's default
// max_allowed_packet of 16 MB) with the SHA-256 of those bytes. A sheet never changes: a trigger refuses every
// UPDATE, and a revision with a sheet cannot be deleted (RESTRICT).
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'sheets',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      revision_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        unique: true,
        references: { model: 'revisions', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      design_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'designs', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      approved_by_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      approved_at: { type: DataTypes.DATE(3), allowNull: false },
      comment: { type: DataTypes.TEXT, allowNull: false },
      a4_pdf: { type: DataTypes.BLOB('long'), allowNull: false },
      a4_sha256: { type: DataTypes.CHAR(64), allowNull: false },
      a4_size: { type: DataTypes.INTEGER, allowNull: false },
      letter_pdf: { type: DataTypes.BLOB('long'), allowNull: false },
      letter_sha256: { type: DataTypes.CHAR(64), allowNull: false },
      letter_size: { type: DataTypes.INTEGER, allowNull: false },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('sheets', ['design_id', 'approved_at'], { name: 'sheets_design_approved' });
  await qi.addIndex('sheets', ['approved_at'], { name: 'sheets_approved_at' });
  await qi.sequelize.query(`
    CREATE TRIGGER sheets_frozen BEFORE UPDATE ON sheets FOR EACH ROW
      SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'A design sheet never changes once published.'`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TRIGGER IF EXISTS sheets_frozen');
  await qi.dropTable('sheets');
};
