import { AsyncLocalStorage } from 'node:async_hooks';
import { Sequelize, type QueryOptions } from 'sequelize';
import { getConfig, type AppConfig } from './config';
import { logger } from './logger';
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
    const config = getConfig();
    instance = createSequelize(config.db);
    guardTransactions(instance, config.isTest ? 'throw' : 'warn');
    initModels(instance);
  }
  return instance;
}

/** The managed transaction the current async call chain runs inside, while its callback runs. */
type HeldTransaction = { sequelize: Sequelize; isOpen: boolean };
const heldTransaction = new AsyncLocalStorage<HeldTransaction>();

/** Raised (under NODE_ENV=test) when code inside a transaction queries or opens a transaction outside it. */
export class TransactionMisuseError extends Error {
  constructor(what: string) {
    super(
      `[db] ${what} inside a transaction but outside it: it needs a second pooled connection while this one is held, ` +
        'which stalls every request once the pool is busy. Pass `transaction`, or `transaction: null` to mean it.',
    );
    this.name = 'TransactionMisuseError';
  }
}

/**
 * Watches for the pattern that stalled the whole app (issue 12, item 2): code inside `sequelize.transaction(cb)` that
 * runs a query without that transaction, or opens a second transaction. Each takes another pooled connection while
 * the first is held; with enough such requests at once every connection is held by a request waiting for one more,
 * and everything stops until the pool gives up 20 s later. Under NODE_ENV=test such a query throws (so every API test
 * checks the rule); elsewhere it is logged. `transaction: null` marks a query that is meant to run on its own (an
 * audit entry that must outlive a rollback).
 */
export function guardTransactions(sequelize: Sequelize, mode: 'throw' | 'warn'): void {
  const misuse = (what: string) => {
    const error = new TransactionMisuseError(what);
    if (mode === 'throw') throw error;
    logger.warn({ err: error }, 'query outside the open transaction');
  };
  const isInsideOpenTransaction = () => {
    const held = heldTransaction.getStore();
    return held?.isOpen === true && held.sequelize === sequelize;
  };

  const query = sequelize.query.bind(sequelize) as (sql: unknown, options?: QueryOptions) => Promise<unknown>;
  sequelize.query = function guardedQuery(sql: unknown, options?: QueryOptions) {
    if (isInsideOpenTransaction() && options?.transaction === undefined) misuse('A query ran');
    return query(sql, options);
  } as typeof sequelize.query;

  const transaction = sequelize.transaction.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
  sequelize.transaction = function guardedTransaction(...args: unknown[]) {
    if (typeof args[args.length - 1] !== 'function') return transaction(...args); // unmanaged: the caller passes it on
    if (isInsideOpenTransaction()) misuse('A second transaction was opened');
    const held: HeldTransaction = { sequelize, isOpen: true };
    return heldTransaction.run(held, async () => {
      try {
        return await transaction(...args);
      } finally {
        held.isOpen = false;
      }
    });
  } as typeof sequelize.transaction;
}

/** Closes the pool (server shutdown, test teardown). Safe to call twice. */
export async function closeSequelize(): Promise<void> {
  const current = instance;
  instance = undefined;
  if (current) await current.close();
}
