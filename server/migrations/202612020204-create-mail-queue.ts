import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// mail_queue: notices written in the same transaction as the state change they announce, then sent after the
// commit and retried with backoff by any server process (claimed with `locked_until`, so two processes never
// send the same row). A mail that cannot be delivered never undoes the transition; it waits here with its error.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'mail_queue',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      kind: { type: DataTypes.STRING(48), allowNull: false },
      to_address: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      text_body: { type: DataTypes.TEXT('long'), allowNull: false },
      html_body: { type: DataTypes.TEXT('long'), allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      last_error: { type: DataTypes.TEXT, allowNull: true },
      next_attempt_at: { type: DataTypes.DATE(3), allowNull: false },
      locked_until: { type: DataTypes.DATE(3), allowNull: true },
      sent_at: { type: DataTypes.DATE(3), allowNull: true },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
      updated_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('mail_queue', ['status', 'next_attempt_at'], { name: 'mail_queue_due' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('mail_queue');
};
