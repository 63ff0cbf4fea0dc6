import type { Sequelize } from 'sequelize';
import { getConfig } from '../../server/config';
import { createSequelize } from '../../server/db';
import { runMigrations, runSeeders, withSchemaOwner } from '../../server/migrator';

/**
 * Refuses to run unless scripts/test.ts prepared the environment (NODE_ENV=test, a throw-away
 * `gw_test_*` database on the test MariaDB). Stops a stray `vitest` run from writing into the
 * development database.
 */
export function assertTestEnvironment(): void {
  const problems: string[] = [];
  if (process.env.GW_TEST_ORCHESTRATED !== '1') problems.push('the test services are not running');
  if (process.env.NODE_ENV !== 'test') problems.push(`NODE_ENV is "${process.env.NODE_ENV}", not "test"`);
  if (!process.env.DB_NAME?.startsWith('gw_test')) problems.push(`DB_NAME "${process.env.DB_NAME}" is not a gw_test_* database`);
  if (problems.length) {
    throw new Error(
      `API and e2e tests need the throw-away MariaDB of scripts/test.ts (${problems.join('; ')}).\n` +
        'Run them with: npm test -- --project api   (or --project e2e)',
    );
  }
}

/** A Sequelize connection to another database on the test server (same host, user, password). */
export function connectTo(databaseName: string): Sequelize {
  return createSequelize({ ...getConfig().db, name: databaseName, poolMax: 2 });
}

/**
 * Applies every migration to `databaseName` as the schema owner, as npm start does (the same migrations production
 * uses; never sync()). The tests themselves then connect as the application's account, which may only read and
 * write rows.
 */
export async function migrateDatabase(databaseName: string): Promise<string[]> {
  return withSchemaOwner(getConfig(), runMigrations, databaseName);
}

/** Runs the demo seeders on `databaseName` as the schema owner (e2e only: API tests never depend on seeds). */
export async function seedDatabase(databaseName: string): Promise<string[]> {
  return withSchemaOwner(getConfig(), runSeeders, databaseName);
}
