import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// sessions: one row per sign-in. The session cookie is a signed token that names a row here by a random id; only
// the SHA-256 of that id is stored. Every request reads the row together with the user (one query), so a session
// ends at once when it is revoked (sign-out, password change, account disabled, "sign out everywhere") instead of
// living on until its token expires.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'sessions',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      user_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
      last_seen_at: { type: DataTypes.DATE(3), allowNull: false },
      expires_at: { type: DataTypes.DATE(3), allowNull: false },
      revoked_at: { type: DataTypes.DATE(3), allowNull: true },
      revoked_reason: { type: DataTypes.STRING(32), allowNull: true },
      user_agent: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      ip: { type: DataTypes.STRING(64), allowNull: false, defaultValue: '' },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('sessions', ['user_id', 'expires_at'], { name: 'sessions_user_expires' });
  await qi.addIndex('sessions', ['expires_at'], { name: 'sessions_expires' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('sessions');
};
