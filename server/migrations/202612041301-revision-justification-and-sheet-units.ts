import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// revisions gain two things the review needs:
// - approval_justification: why a reviewer approved a revision although a check failed (required then; printed on
//   the sheet and written to the audit log); null for every other approval.
// - sheet_units: the unit system the designer chose at submission for the design sheet (metric | imperial).
// Neither is part of the frozen document (the revisions_frozen trigger guards inputs, results and fingerprint only).
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.addColumn('revisions', 'approval_justification', { type: DataTypes.TEXT, allowNull: true });
  await qi.addColumn('revisions', 'sheet_units', { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'metric' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.removeColumn('revisions', 'sheet_units');
  await qi.removeColumn('revisions', 'approval_justification');
};
