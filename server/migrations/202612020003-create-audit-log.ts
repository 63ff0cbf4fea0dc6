import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'audit_log',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      actor_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'users', key: 'id' },
        onDelete: 'SET NULL',
        onUpdate: 'CASCADE',
      },
      action: { type: DataTypes.STRING(64), allowNull: false },
      entity: { type: DataTypes.STRING(64), allowNull: false },
      entity_id: { type: DataTypes.INTEGER, allowNull: true },
      from_state: { type: DataTypes.STRING(64), allowNull: true },
      to_state: { type: DataTypes.STRING(64), allowNull: true },
      reason: { type: DataTypes.TEXT, allowNull: true },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('audit_log', ['entity', 'entity_id'], { name: 'audit_log_entity' });
  await qi.addIndex('audit_log', ['created_at'], { name: 'audit_log_created_at' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('audit_log');
};
