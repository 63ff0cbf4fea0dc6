/**
 * `npm run db:migrate [-- <command>]`: schema migrations and demo seeders of the development database.
 *   up        apply pending migrations (default)
 *   down      undo the last migration          down --to 0   undo all of them
 *   status    list applied and pending migrations and seeders
 *   seed      apply pending demo seeders        unseed        undo the last seeder
 * Starts the project's MariaDB for the duration when it is local and not running.
 */
import path from 'node:path';
import { ConfigError, getConfig, loadDotEnv } from '../server/config';
import { ensureDatabases, startMariaDb, type MariaDbHandle } from './db';

const say = (line: string) => process.stdout.write(`${line}\n`);

async function main(): Promise<void> {
  loadDotEnv();
  const config = getConfig();
  const [command = 'up', ...rest] = process.argv.slice(2);
  const { createSequelize } = await import('../server/db');
  const { createMigrator, createSeeder, schemaOwnerDb } = await import('../server/migrator');
  const { initModels } = await import('../server/models');

  let db: MariaDbHandle | undefined;
  if (['127.0.0.1', 'localhost'].includes(config.db.host) && (config.db.nodes?.length ?? 1) === 1) {
    db = await startMariaDb({ dir: path.join(config.dataDir, 'mariadb'), port: config.db.port, log: say });
    await ensureDatabases(db, {
      databases: [config.db.name],
      user: config.db.user,
      password: config.db.password,
      owner: config.dbOwner ?? undefined,
    });
  }
  // Schema work runs as the schema owner (DB_OWNER_USER); the server itself never holds those rights.
  const sequelize = createSequelize(schemaOwnerDb(config));
  initModels(sequelize);
  try {
    const migrator = createMigrator(sequelize);
    const seeder = createSeeder(sequelize);
    const names = (list: Array<{ name: string }>) => (list.length ? list.map((m) => `  ${m.name}`).join('\n') : '  (none)');
    switch (command) {
      case 'up':
        say(`Applied:\n${names(await migrator.up())}`);
        break;
      case 'down': {
        const toIndex = rest.indexOf('--to');
        const result = toIndex >= 0 && rest[toIndex + 1] === '0' ? await migrator.down({ to: 0 }) : await migrator.down();
        say(`Reverted:\n${names(result)}`);
        break;
      }
      case 'status':
        say(`Migrations applied:\n${names(await migrator.executed())}\nMigrations pending:\n${names(await migrator.pending())}`);
        say(`Seeders applied:\n${names(await seeder.executed())}\nSeeders pending:\n${names(await seeder.pending())}`);
        break;
      case 'seed':
        say(`Seeded:\n${names(await seeder.up())}`);
        break;
      case 'unseed':
        say(`Unseeded:\n${names(await seeder.down())}`);
        break;
      default:
        throw new Error(`Unknown command "${command}". Use up, down [--to 0], status, seed or unseed.`);
    }
  } finally {
    await sequelize.close();
    // Leave an instance that was already running (e.g. by npm start) alone; stop one we started.
    if (db && !db.adopted) await db.stop();
  }
}

main().catch((err: unknown) => {
  process.stderr.write(`${err instanceof ConfigError || err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
