import { Sequelize } from 'sequelize';
import { getConfig, type AppConfig } from './config';
import { initModels } from './models';

let instance: Sequelize | undefined;

/**
 * Creates a Sequelize instance for a MariaDB database. Used directly by scripts and test setup
 * (which need other databases than the app's); the app itself goes through getSequelize().
 */
export function createSequelize(db: AppConfig['db']): Sequelize {
  return new Sequelize(db.name, db.user, db.password, {
    dialect: 'mariadb',
    host: db.host,
    port: db.port,
    logging: false,
    timezone: '+00:00',
    pool: { max: db.poolMax, min: 0, idle: 10_000, acquire: 20_000 },
    dialectOptions: { connectTimeout: 5000, timezone: 'Etc/UTC' },
    define: { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', underscored: true },
    // Scaling: add `replication: { read: [{ host }...], write: { host } }` here to send reads to
    // replicas (see README "Scaling past one machine"). Nothing else in the app needs to change.
  });
}

/** The single Sequelize instance of this process, with every model initialised on it. */
export function getSequelize(): Sequelize {
  if (!instance) {
    instance = createSequelize(getConfig().db);
    initModels(instance);
  }
  return instance;
}

/** Closes the pool (server shutdown, test teardown). Safe to call twice. */
export async function closeSequelize(): Promise<void> {
  const current = instance;
  instance = undefined;
  if (current) await current.close();
}
