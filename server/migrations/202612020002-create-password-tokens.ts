import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'password_tokens',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      purpose: { type: DataTypes.ENUM('reset', 'invite'), allowNull: false },
      expires_at: { type: DataTypes.DATE(3), allowNull: false },
      used_at: { type: DataTypes.DATE(3), allowNull: true },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('password_tokens', ['user_id'], { name: 'password_tokens_user_id' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  // Dropping the table drops its index and foreign key with it.
  await qi.dropTable('password_tokens');
};
