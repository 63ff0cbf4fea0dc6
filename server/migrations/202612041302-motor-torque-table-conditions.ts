import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// Shelf motors gain `torqueCurveConditions` in their data: the supply voltage and driver current their torque table
// was measured at ({supplyV, currentRmsA}, or null when not recorded). Existing motors get the key as null, so every
// motor row has the same shape; a table uploaded before this change is "not recorded" and designs using it are warned.
type Row = { id: number; data: string | Record<string, unknown> };

async function motors(qi: QueryInterface): Promise<Row[]> {
  const [rows] = await qi.sequelize.query("SELECT id, data FROM parts WHERE kind = 'motor'");
  return rows as Row[];
}

const parse = (data: Row['data']): Record<string, unknown> => (typeof data === 'string' ? JSON.parse(data) : data);

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  for (const row of await motors(qi)) {
    const data = parse(row.data);
    if ('torqueCurveConditions' in data) continue;
    await qi.sequelize.query('UPDATE parts SET data = ? WHERE id = ?', {
      replacements: [JSON.stringify({ ...data, torqueCurveConditions: null }), row.id],
    });
  }
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  for (const row of await motors(qi)) {
    const { torqueCurveConditions: _dropped, ...data } = parse(row.data);
    await qi.sequelize.query('UPDATE parts SET data = ? WHERE id = ?', { replacements: [JSON.stringify(data), row.id] });
  }
};
