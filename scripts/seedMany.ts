/**
 * `npm run seed:many [-- --count 10000] [--database <name>]`: a database full of designs, for trying the Designs
 * list at size. It creates a separate database (default: DB_NAME + "_many", never the one `npm start` uses),
 * migrates it, loads the demo data, and adds `count` invented designs (default 10,000) owned by the demo designers
 * and 20 extra designers, with names from word lists, every status and mechanism, dates over two years.
 * Point the app at it with DB_NAME=<name> npm start. `npm run bench -- list` uses the same function.
 */
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Sequelize } from 'sequelize';
import { defaultDesign, parseDesign, type Mechanism } from '@/engine';

const ADJECTIVES = [
  'Compact',
  'Wide',
  'Light',
  'Rigid',
  'Quiet',
  'Fast',
  'Long',
  'Shop',
  'Bench',
  'Desk',
  'Twin',
  'Open',
  'Enclosed',
  'Heavy',
  'Fine',
];
const JOBS = [
  'dispensing',
  'engraving',
  'inspection',
  'plotting',
  'pick-and-place',
  'laser',
  'drawing',
  'scanning',
  'cutting',
  'glue',
  'sorting',
  'camera',
];
const THINGS = ['stage', 'table', 'gantry', 'frame', 'rig', 'carriage', 'bed', 'portal'];
const MECHANISMS: Mechanism[] = ['corexy', 'hbot', 'cartesian'];
const STATUSES = ['draft', 'draft', 'draft', 'in_review', 'approved', 'returned'] as const;

/** A small deterministic generator, so every run seeds the same designs. */
function random(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/**
 * Adds `count` invented designs (and 20 extra designers, once) to a migrated, demo-seeded database.
 * @param sequelize - connection to that database (models are bound to it here)
 * @param count - designs to add
 * @param log - progress lines
 */
export async function seedManyDesigns(sequelize: Sequelize, count: number, log: (line: string) => void = () => undefined): Promise<void> {
  const { initModels, Design, User } = await import('../server/models');
  const { computeStoredResults } = await import('../server/services/designs.service');
  initModels(sequelize);
  const template = await User.findOne({ where: { email: 'designer@example.test' } });
  if (!template) throw new Error('seed:many needs the demo users (run the demo seeders first)');
  const extra = Array.from({ length: 20 }, (_, i) => ({
    email: `designer-${String(i + 1).padStart(2, '0')}@example.test`,
    name: `${['Avery', 'Blair', 'Casey', 'Devon', 'Emery', 'Finley', 'Greer', 'Harper', 'Indy', 'Jules'][i % 10]} ${['Ashdown', 'Brackley', 'Corrin'][i % 3]}-${i + 1}`,
    roles: ['designer'],
    passwordHash: template.passwordHash,
    disabled: false,
  }));
  await User.bulkCreate(extra as never[], { ignoreDuplicates: true });
  const owners = await User.findAll({
    where: { email: [...extra.map((e) => e.email), 'designer@example.test', 'designer2@example.test'] },
  });

  // The engine runs once per mechanism: every seeded design of a mechanism shares its inputs and stored results.
  const base = Object.fromEntries(
    MECHANISMS.map((m) => {
      const inputs = parseDesign({ ...defaultDesign(m), name: 'seed' });
      return [m, { inputs, stored: computeStoredResults(inputs) }];
    }),
  ) as Record<Mechanism, { inputs: ReturnType<typeof parseDesign>; stored: ReturnType<typeof computeStoredResults> }>;

  const rnd = random(20261204);
  const pick = <T>(list: readonly T[]): T => list[Math.floor(rnd() * list.length)];
  const now = Date.now();
  const twoYears = 2 * 365 * 24 * 3600 * 1000;
  const BATCH = 500;
  for (let done = 0; done < count; done += BATCH) {
    const rows = [];
    for (let i = done; i < Math.min(count, done + BATCH); i++) {
      const mechanism = pick(MECHANISMS);
      const owner = pick(owners);
      const name = `${pick(ADJECTIVES)} ${pick(JOBS)} ${pick(THINGS)} ${String(i + 1).padStart(5, '0')}`;
      const createdAt = new Date(now - rnd() * twoYears);
      const updatedAt = new Date(createdAt.getTime() + rnd() * (now - createdAt.getTime()));
      rows.push({
        name,
        mechanism,
        status: pick(STATUSES),
        ownerId: owner.id,
        ownerName: owner.name,
        updatedById: owner.id,
        inputs: { ...base[mechanism].inputs, name } as unknown as Record<string, unknown>,
        ...base[mechanism].stored,
        version: 1 + Math.floor(rnd() * 5),
        createdAt,
        updatedAt,
      });
    }
    await Design.bulkCreate(rows as never[], { validate: false, hooks: false });
    if ((done / BATCH) % 4 === 0) log(`  ${Math.min(count, done + BATCH)} / ${count} designs`);
  }
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const arg = (name: string) => {
    const i = args.indexOf(`--${name}`);
    return i >= 0 ? args[i + 1] : undefined;
  };
  const count = Number(arg('count') ?? 10_000);
  if (!Number.isInteger(count) || count < 1 || count > 1_000_000) {
    process.stderr.write('--count must be a whole number from 1 to 1000000\n');
    process.exit(2);
  }
  const { getConfig, loadDotEnv } = await import('../server/config');
  loadDotEnv();
  const config = getConfig();
  const database = arg('database') ?? `${config.db.name}_many`;
  if (database === config.db.name) {
    process.stderr.write(`--database must not be ${config.db.name}, the database npm start uses\n`);
    process.exit(2);
  }
  const { ensureDatabases, recreateDatabase, startMariaDb } = await import('./db');
  const db = ['127.0.0.1', 'localhost'].includes(config.db.host)
    ? await startMariaDb({ dir: path.join(config.dataDir, 'mariadb'), port: config.db.port, log: (l) => process.stdout.write(`${l}\n`) })
    : null;
  if (db) {
    // The accounts' grants are set afresh for every database named, so npm start's database is named too.
    await ensureDatabases(db, {
      databases: [config.db.name, database],
      user: config.db.user,
      password: config.db.password,
      owner: config.dbOwner ?? undefined,
    });
    await recreateDatabase(db, database);
  }
  const { createSequelize } = await import('../server/db');
  const { runMigrations, runSeeders, schemaOwnerDb } = await import('../server/migrator');
  // Schema and demo data as the schema owner, like npm start.
  const sequelize = createSequelize({ ...schemaOwnerDb(config, database), poolMax: config.db.poolMax });
  try {
    await runMigrations(sequelize);
    await runSeeders(sequelize);
    await seedManyDesigns(sequelize, count, (l) => process.stdout.write(`${l}\n`));
    process.stdout.write(`${database}: demo data and ${count} designs. Try it with DB_NAME=${database} npm start\n`);
  } finally {
    await sequelize.close();
    if (db && !db.adopted) await db.stop();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((err: unknown) => {
    process.stderr.write(`${(err as Error).message}\n`);
    process.exit(1);
  });
}
