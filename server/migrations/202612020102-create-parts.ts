import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// parts: the shared parts shelf. One table for belts, pulleys and motors; the kind-specific numbers are a
// JSON document shaped like the matching design sub-object. A name is unique within its kind.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'parts',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      kind: { type: DataTypes.STRING(16), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      data: { type: DataTypes.JSON, allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: false },
      retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      created_by_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'users', key: 'id' },
        onDelete: 'SET NULL',
        onUpdate: 'CASCADE',
      },
      updated_by_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'users', key: 'id' },
        onDelete: 'SET NULL',
        onUpdate: 'CASCADE',
      },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
      updated_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('parts', ['kind', 'name'], { name: 'parts_kind_name', unique: true });
  await qi.addIndex('parts', ['kind', 'retired'], { name: 'parts_kind_retired' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('parts');
};
