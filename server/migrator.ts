import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug, type MigrationFn, type RunnableMigration } from 'umzug';
import type { AppConfig } from './config';
import { createSequelize } from './db';
import { ROOT_DIR } from './paths';
import { initModels, User } from './models';

/** Context handed to every demo seeder. Seeders may use the models: they run after all migrations. */
export type SeedContext = { sequelize: Sequelize; queryInterface: QueryInterface };

/** `<YYYYMMDDHHMM>-<kebab>.ts`: the only files umzug picks up, so helpers may sit beside them. */
const STEP_FILE = /^\d{12}-[a-z0-9-]+\.ts$/;

export const MIGRATIONS_DIR = path.join(ROOT_DIR, 'server', 'migrations');
export const SEEDERS_DIR = path.join(ROOT_DIR, 'server', 'seeders');

type StepModule<T> = { up: MigrationFn<T>; down?: MigrationFn<T> };

/** Lists the step files of a folder in name (= time) order and loads each lazily with import(). */
function listSteps<T>(dir: string): RunnableMigration<T>[] {
  const files = fs.existsSync(dir)
    ? fs
        .readdirSync(dir)
        .filter((f) => STEP_FILE.test(f))
        .sort()
    : [];
  return files.map((file) => {
    const filePath = path.join(dir, file);
    const load = async (): Promise<StepModule<T>> => {
      const mod = (await import(pathToFileURL(filePath).href)) as Partial<StepModule<T>>;
      if (typeof mod.up !== 'function') throw new Error(`${file} must export an async up() function`);
      return mod as StepModule<T>;
    };
    return {
      name: file.replace(/\.ts$/, ''),
      path: filePath,
      up: async (params) => (await load()).up(params),
      down: async (params) => {
        const mod = await load();
        if (!mod.down) throw new Error(`${file} has no down() function`);
        return mod.down(params);
      },
    };
  });
}

type UmzugLogger = ConstructorParameters<typeof Umzug>[0]['logger'];

/** Schema migrations: server/migrations, recorded in the `SequelizeMeta` table. */
export function createMigrator(sequelize: Sequelize, logger: UmzugLogger = undefined): Umzug<QueryInterface> {
  return new Umzug<QueryInterface>({
    migrations: listSteps<QueryInterface>(MIGRATIONS_DIR),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'SequelizeMeta' }),
    logger,
  });
}

/** Demo seeders: server/seeders, recorded in their own `seed_meta` table so each runs once. */
export function createSeeder(sequelize: Sequelize, logger: UmzugLogger = undefined): Umzug<SeedContext> {
  return new Umzug<SeedContext>({
    migrations: listSteps<SeedContext>(SEEDERS_DIR),
    context: { sequelize, queryInterface: sequelize.getQueryInterface() },
    storage: new SequelizeStorage({ sequelize, tableName: 'seed_meta' }),
    logger,
  });
}

/** Applies every pending migration. @returns the names applied. */
export async function runMigrations(sequelize: Sequelize): Promise<string[]> {
  const applied = await createMigrator(sequelize).up();
  return applied.map((m) => m.name);
}

/**
 * Applies every pending demo seeder. Seeders use the models, so they are bound to `sequelize` for the run and bound
 * back afterwards to whatever instance they served before (the server's, when npm start seeds with the owner's
 * connection and then serves with the application's).
 * @returns the names applied.
 */
export async function runSeeders(sequelize: Sequelize): Promise<string[]> {
  const previous = boundSequelize();
  if (previous !== sequelize) initModels(sequelize);
  try {
    const applied = await createSeeder(sequelize).up();
    return applied.map((m) => m.name);
  } finally {
    if (previous && previous !== sequelize) initModels(previous);
  }
}

/** The instance the models are bound to now, if any. */
function boundSequelize(): Sequelize | undefined {
  try {
    return User.sequelize ?? undefined;
  } catch {
    return undefined; // never initialised
  }
}

/**
 * Connection settings for schema work (migrations, seeders): the schema owner's account (DB_OWNER_USER and
 * DB_OWNER_PASSWORD) when configured, else the application's own (which then needs the DDL rights itself).
 * @param databaseName - another database on the same server (tests), default DB_NAME
 */
export function schemaOwnerDb(config: AppConfig, databaseName = config.db.name): AppConfig['db'] {
  return { ...config.db, name: databaseName, poolMax: 2, ...(config.dbOwner ?? {}) };
}

/** Runs `work` on a connection as the schema owner (see {@link schemaOwnerDb}) and closes it afterwards. */
export async function withSchemaOwner<T>(config: AppConfig, work: (sequelize: Sequelize) => Promise<T>, databaseName?: string): Promise<T> {
  const sequelize = createSequelize(schemaOwnerDb(config, databaseName));
  try {
    return await work(sequelize);
  } finally {
    await sequelize.close();
  }
}
