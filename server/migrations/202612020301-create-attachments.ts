import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// attachments: uploaded files and their metadata. The bytes live in the content-addressed store under
// UPLOAD_DIR (never at a path a user chose), named by their SHA-256; this table says who uploaded what, under which
// (sanitised) name and type. A row belongs either to a design (datasheets, photos, CSV) or to a motor on the parts
// shelf (the source file of its torque–speed table): exactly one of design_id / part_id is set (enforced by triggers). Several rows may
// share one sha256; the bytes are removed only when the last row referring to them goes.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'attachments',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      design_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'designs', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      part_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'parts', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      uploaded_by_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'users', key: 'id' },
        onDelete: 'SET NULL',
        onUpdate: 'CASCADE',
      },
      file_name: { type: DataTypes.STRING(200), allowNull: false },
      mime: { type: DataTypes.STRING(40), allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('attachments', ['design_id', 'created_at'], { name: 'attachments_design_created' });
  await qi.addIndex('attachments', ['part_id', 'created_at'], { name: 'attachments_part_created' });
  await qi.addIndex('attachments', ['sha256'], { name: 'attachments_sha256' });
  // MariaDB refuses a CHECK on columns with a foreign-key action (CASCADE), so triggers keep "exactly one owner".
  for (const event of ['INSERT', 'UPDATE']) {
    await qi.sequelize.query(`
      CREATE TRIGGER attachments_one_owner_${event.toLowerCase()} BEFORE ${event} ON attachments FOR EACH ROW
        IF (NEW.design_id IS NULL) = (NEW.part_id IS NULL) THEN
          SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'An attachment belongs to exactly one design or one part.';
        END IF`);
  }
  await qi.sequelize.query("ALTER TABLE attachments ADD CONSTRAINT attachments_sha256_hex CHECK (sha256 REGEXP '^[0-9a-f]{64}$')");
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TRIGGER IF EXISTS attachments_one_owner_insert');
  await qi.sequelize.query('DROP TRIGGER IF EXISTS attachments_one_owner_update');
  await qi.dropTable('attachments');
};
