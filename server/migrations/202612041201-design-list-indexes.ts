import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// The Designs list sorts by name, last change, status, mechanism, owner and creation date, filters by status,
// mechanism and owner, and searches names. With thousands of designs each of those must be an index range, not a
// scan and a sort of every row:
// - owner_name: the owner's name kept on the design (the model fills it on insert and when the owner changes; a
//   user's rename updates their designs), so "sort by owner" needs no join and uses its own index;
// - one index per sort key, and (filter, last change) pairs for the filters with the default sort;
// - a FULLTEXT index on the name for word-prefix search (short words fall back to a name-prefix range).
// InnoDB appends the primary key to every secondary index, so each one also orders the id tie-breaker.
const INDEXES: { name: string; fields: string[] }[] = [
  { name: 'designs_owner_name', fields: ['owner_name'] },
  { name: 'designs_created_at', fields: ['created_at'] },
  { name: 'designs_mechanism', fields: ['mechanism'] },
  { name: 'designs_status_updated_at', fields: ['status', 'updated_at'] },
  { name: 'designs_mechanism_updated_at', fields: ['mechanism', 'updated_at'] },
  { name: 'designs_owner_id_updated_at', fields: ['owner_id', 'updated_at'] },
];

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.addColumn('designs', 'owner_name', { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' });
  await qi.sequelize.query('UPDATE designs d JOIN users u ON u.id = d.owner_id SET d.owner_name = u.name');
  for (const index of INDEXES) await qi.addIndex('designs', index.fields, { name: index.name });
  await qi.addIndex('designs', ['name'], { name: 'designs_name_fulltext', type: 'FULLTEXT' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.removeIndex('designs', 'designs_name_fulltext');
  for (const index of [...INDEXES].reverse()) await qi.removeIndex('designs', index.name);
  await qi.removeColumn('designs', 'owner_name');
};
