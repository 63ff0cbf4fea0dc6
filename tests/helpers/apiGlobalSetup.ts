import { assertTestEnvironment, migrateDatabase } from './db';

/**
 * Global setup of the `api` project: the database named by DB_NAME (gw_test_api, created empty by
 * scripts/test.ts) gets every migration. Tests then create their own rows.
 */
export default async function setup(): Promise<void> {
  assertTestEnvironment();
  await migrateDatabase(process.env.DB_NAME as string);
}
