import { getConfig, resetConfigCache } from '../../server/config';
import { createSequelize } from '../../server/db';
import { runMigrations, runSeeders } from '../../server/migrator';
import { say } from './lib';

/**
 * Migrates a bench database and loads the demo data (both are no-ops when already done).
 * @param database - database name on the bench MariaDB
 */
export async function migrateAndSeed(database: string): Promise<void> {
  resetConfigCache();
  const sequelize = createSequelize({ ...getConfig().db, name: database, poolMax: 2 });
  try {
    await runMigrations(sequelize);
    await runSeeders(sequelize);
  } finally {
    await sequelize.close();
  }
}

/**
 * The 10,000-design database of the list benchmark, seeded on first use (kept in .data-bench afterwards).
 * @param database - database name
 * @param count - designs wanted
 */
export async function ensureManyDesigns(database: string, count: number): Promise<void> {
  await migrateAndSeed(database);
  resetConfigCache();
  const sequelize = createSequelize({ ...getConfig().db, name: database, poolMax: 2 });
  try {
    const [[row]] = (await sequelize.query('SELECT COUNT(*) AS n FROM designs')) as [{ n: number | string }[], unknown];
    const have = Number(row.n);
    if (have >= count) return;
    say(`list: seeding ${count - have} designs into ${database} (once; kept in .data-bench)…`);
    const { seedManyDesigns } = await import('../seedMany');
    await seedManyDesigns(sequelize, count - have, say);
  } finally {
    await sequelize.close();
  }
}
