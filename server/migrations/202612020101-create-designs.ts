import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// designs: the current, editable state of each design. `version` is the optimistic lock that every save
// bumps; travel is stored at save time so the Designs table can sort and show it without the engine.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'designs',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      name: { type: DataTypes.STRING(200), allowNull: false },
      mechanism: { type: DataTypes.STRING(16), allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'draft' },
      owner_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      updated_by_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'users', key: 'id' },
        onDelete: 'SET NULL',
        onUpdate: 'CASCADE',
      },
      inputs: { type: DataTypes.JSON, allowNull: false },
      travel_x_mm: { type: DataTypes.DOUBLE, allowNull: false },
      travel_y_mm: { type: DataTypes.DOUBLE, allowNull: false },
      result_summary: { type: DataTypes.JSON, allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
      updated_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('designs', ['owner_id'], { name: 'designs_owner_id' });
  await qi.addIndex('designs', ['status'], { name: 'designs_status' });
  await qi.addIndex('designs', ['updated_at'], { name: 'designs_updated_at' });
  await qi.addIndex('designs', ['name'], { name: 'designs_name' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('designs');
};
