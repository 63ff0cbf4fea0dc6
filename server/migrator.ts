import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug, type MigrationFn, type RunnableMigration } from 'umzug';
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

/** Applies every pending demo seeder (binding the models to `sequelize` first). @returns the names applied. */
export async function runSeeders(sequelize: Sequelize): Promise<string[]> {
  if (User.sequelize !== sequelize) initModels(sequelize);
  const applied = await createSeeder(sequelize).up();
  return applied.map((m) => m.name);
}
