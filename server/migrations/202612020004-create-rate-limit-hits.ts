import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// Rate limit counters live in MariaDB so every API process behind a load balancer shares them.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'rate_limit_hits',
    {
      key: { type: DataTypes.STRING(191), primaryKey: true, allowNull: false },
      hits: { type: DataTypes.INTEGER, allowNull: false },
      reset_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('rate_limit_hits', ['reset_at'], { name: 'rate_limit_hits_reset_at' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('rate_limit_hits');
};
