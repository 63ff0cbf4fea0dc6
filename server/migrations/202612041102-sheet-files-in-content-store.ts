import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// Design sheets published from now on keep their PDF bytes in the content store (a local folder or an S3 bucket,
// named by the SHA-256 the row already holds) instead of the row: a database cluster then replicates kilobytes of
// metadata instead of every PDF. Rows published before keep their bytes in a4_pdf / letter_pdf and are served from
// there; new rows leave those columns NULL. The indexes let the content registry count references to a hash.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.changeColumn('sheets', 'a4_pdf', { type: DataTypes.BLOB('long'), allowNull: true });
  await qi.changeColumn('sheets', 'letter_pdf', { type: DataTypes.BLOB('long'), allowNull: true });
  await qi.addIndex('sheets', ['a4_sha256'], { name: 'sheets_a4_sha256' });
  await qi.addIndex('sheets', ['letter_sha256'], { name: 'sheets_letter_sha256' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  const [row] = await qi.sequelize.query<{ n: number | string }>(
    'SELECT COUNT(*) AS n FROM sheets WHERE a4_pdf IS NULL OR letter_pdf IS NULL',
    {
      type: QueryTypes.SELECT,
    },
  );
  if (Number(row?.n ?? 0) > 0) {
    throw new Error('Some design sheets keep their PDFs in the content store; this migration cannot be undone without losing them.');
  }
  await qi.removeIndex('sheets', 'sheets_letter_sha256');
  await qi.removeIndex('sheets', 'sheets_a4_sha256');
  await qi.changeColumn('sheets', 'letter_pdf', { type: DataTypes.BLOB('long'), allowNull: false });
  await qi.changeColumn('sheets', 'a4_pdf', { type: DataTypes.BLOB('long'), allowNull: false });
};
