import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// stored_contents: one row per SHA-256 in the content store (local folder or S3 bucket), written by every transaction
// that adds a reference to those bytes and by whoever removes them. Writing one shared row is what orders a new
// reference against a removal across app processes and Galera nodes (row locks alone are local to one node); see
// server/storage/contentRegistry.ts. State: live (referenced), orphan (nothing referred to it a moment ago),
// removing (claimed by one remover with a random token until claimed_until).
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'stored_contents',
    {
      sha256: { type: DataTypes.CHAR(64), primaryKey: true, allowNull: false },
      size: { type: DataTypes.BIGINT, allowNull: true },
      state: { type: DataTypes.STRING(12), allowNull: false },
      orphan_since: { type: DataTypes.DATE(3), allowNull: true },
      claim_token: { type: DataTypes.CHAR(32), allowNull: true },
      claimed_until: { type: DataTypes.DATE(3), allowNull: true },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
      updated_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('stored_contents', ['state', 'orphan_since'], { name: 'stored_contents_state' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('stored_contents');
};
