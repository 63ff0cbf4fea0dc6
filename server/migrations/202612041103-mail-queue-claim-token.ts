import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// mail_queue.claim_token: a sender claims due rows with one conditional UPDATE that writes its own random token and a
// lease (locked_until), then reads back only the rows carrying its token, and records the outcome only where the
// token is still its own. Any number of processes (on any database node) can then share the queue and each mail
// goes out once; a sender that crashed loses its rows when the lease runs out.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.addColumn('mail_queue', 'claim_token', { type: DataTypes.CHAR(32), allowNull: true });
  await qi.addIndex('mail_queue', ['claim_token'], { name: 'mail_queue_claim_token' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.removeIndex('mail_queue', 'mail_queue_claim_token');
  await qi.removeColumn('mail_queue', 'claim_token');
};
