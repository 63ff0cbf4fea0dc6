import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// measurements: belt tension checks a maker records against an approved sheet, one row per pluck. The span, its
// length and the belt's mass per metre come from the sheet's FROZEN revision; the target and the tension are stored
// as computed at the time, so a later engine change never rewrites what was measured. A recording keeps its
// SHA-256 (bytes in the content store under UPLOAD_DIR), the analysis confidence and a small spectrum for plotting.
// Rows are never changed or deleted by the app.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'measurements',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      sheet_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'sheets', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      span_id: { type: DataTypes.STRING(120), allowNull: false },
      belt_id: { type: DataTypes.STRING(40), allowNull: false },
      span_length_mm: { type: DataTypes.DOUBLE, allowNull: false },
      linear_mass_kg_per_m: { type: DataTypes.DOUBLE, allowNull: false },
      frequency_hz: { type: DataTypes.DOUBLE, allowNull: false },
      tension_n: { type: DataTypes.DOUBLE, allowNull: false },
      target_frequency_hz: { type: DataTypes.DOUBLE, allowNull: false },
      target_tension_n: { type: DataTypes.DOUBLE, allowNull: false },
      deviation_pct: { type: DataTypes.DOUBLE, allowNull: false },
      source: { type: DataTypes.STRING(16), allowNull: false },
      confidence: { type: DataTypes.DOUBLE, allowNull: true },
      spectrum: { type: DataTypes.JSON, allowNull: true },
      recording_sha256: { type: DataTypes.CHAR(64), allowNull: true },
      recording_size: { type: DataTypes.INTEGER, allowNull: true },
      recording_name: { type: DataTypes.STRING(200), allowNull: true },
      measured_by_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      measured_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('measurements', ['sheet_id', 'span_id', 'measured_at'], { name: 'measurements_sheet_span_at' });
  await qi.addIndex('measurements', ['recording_sha256'], { name: 'measurements_recording_sha256' });
  await qi.sequelize.query("ALTER TABLE measurements ADD CONSTRAINT measurements_source CHECK (source IN ('typed', 'recording'))");
  await qi.sequelize.query(
    "ALTER TABLE measurements ADD CONSTRAINT measurements_recording CHECK ((source = 'recording') = (recording_sha256 IS NOT NULL))",
  );
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('measurements');
};
