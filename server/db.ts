import { AsyncLocalStorage } from 'node:async_hooks';
import mariadb, { type Connection, type ConnectionConfig } from 'mariadb';
import { Sequelize, type Options, type QueryOptions, type Transaction, type TransactionOptions } from 'sequelize';
import { getConfig, type AppConfig, type DbNode } from './config';
import { AppError } from './errors';
import { logger } from './logger';
import { initModels } from './models';

/**
 * The database connection of this process.
 *
 * Three set-ups, chosen by configuration (README "Scaling past one machine"):
 * 1. One MariaDB server (DB_HOST:DB_PORT) — `npm start` and `npm test`.
 * 2. A primary with read replicas (DB_HOST:DB_PORT + DB_READ_REPLICAS): the simpler way to spread load. Sequelize's
 *    `replication` option sends reads outside transactions to the replicas and everything else to the primary.
 *    Replication is asynchronous, so a read may miss a write made a moment before on the primary (a save, then a
 *    reload); the optimistic lock turns the worst case into a 409, never into a lost update. If the primary dies,
 *    writes stop until it is back or an operator promotes a replica and points DB_HOST at it: there is no
 *    automatic failover in this set-up.
 * 3. Several servers that all accept writes, a MariaDB Galera cluster (DB_NODES): every new connection goes to the
 *    first node in the list that answers and is synced (`wsrep_local_state` 4), skipping one that failed a moment
 *    ago; reads wait for every write committed before them (`wsrep_sync_wait`). What a cluster changes for the code:
 *    - A write conflict between nodes shows only at COMMIT (or at the next statement) as error 1213/SQLSTATE 40001
 *      ("certification failure"). Every managed transaction (`sequelize.transaction(async (t) => …)`) is therefore
 *      run again from the start, a few times, on 1213, on 1047 ("WSREP has not yet prepared node": the node is
 *      leaving or joining) and on a connection lost before COMMIT was sent. After the last attempt a conflict is a
 *      409 `write_conflict`, a lost server a 503 `db_unavailable`. Callbacks must therefore be safe to run twice:
 *      they only touch the database through their transaction, and content-addressed bytes (idempotent).
 *    - A connection lost while COMMIT (or an autocommit write) was under way leaves the outcome unknown: it is not
 *      retried (that could apply it twice) and answers 503 `db_outcome_unknown`.
 *    - Optimistic locking (`UPDATE … WHERE version = ?`) stays exact: two nodes accepting the same row's update
 *      make one of them fail certification; its retry finds the new version and answers 409.
 *    - Row locks (`SELECT … FOR UPDATE`) are local to one node; a decision that reads rows another node may write
 *      without writing them itself must write a shared row to be certified (see server/storage/contentRegistry.ts).
 *    - Auto-increment ids step by the cluster size (Galera's auto_increment_control): never guess ids.
 *    - No GET_LOCK, no session variables carried between requests, triggers run where the write happens and
 *      refuse the same updates on every node (row-based replication).
 */

let instance: Sequelize | undefined;

/** Sequelize's error wrappers keep the driver's error in `parent`/`original`. */
type DriverError = Error & { errno?: number; sqlState?: string; code?: string; fatal?: boolean };

function driverError(err: unknown): DriverError | undefined {
  if (!err || typeof err !== 'object') return undefined;
  const e = err as { parent?: unknown; original?: unknown };
  return (e.parent ?? e.original ?? err) as DriverError;
}

/**
 * How a database error bears on retrying:
 * - `conflict`: a deadlock or a Galera certification failure (1213, SQLSTATE 40001): the transaction was rolled back.
 * - `not_ready`: the node refused the statement (1047: leaving, joining or not in the primary component).
 * - `not_sent`: no connection could be made, or it was already closed before the statement went out.
 * - `lost`: the connection died while a statement was under way: it may or may not have run.
 * - null: anything else (not retried).
 */
export type DbFailureKind = 'conflict' | 'not_ready' | 'not_sent' | 'lost';

const NOT_SENT_ERRNOS = new Set([45001, 45004, 45012, 45013]); // already closed, destroyed, connect timeout, closed
const NOT_SENT_CODES = new Set(['ECONNREFUSED', 'EHOSTUNREACH', 'ENETUNREACH', 'EADDRNOTAVAIL', 'ENOTFOUND', 'ETIMEDOUT']);
const CONNECTION_ERROR_NAMES = new Set([
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeHostNotFoundError',
  'SequelizeHostNotReachableError',
  'SequelizeInvalidConnectionError',
  'SequelizeConnectionTimedOutError',
]);

/** Classifies an error from Sequelize or the mariadb driver (see {@link DbFailureKind}). */
export function classifyDbError(err: unknown): DbFailureKind | null {
  if (!err || typeof err !== 'object') return null;
  const outer = err as Error;
  const inner = driverError(err);
  if (!inner) return null;
  if (inner.errno === 1213 || inner.sqlState === '40001') return 'conflict';
  if (inner.errno === 1047) return 'not_ready';
  // Errors raised while opening a connection: nothing was sent.
  if (CONNECTION_ERROR_NAMES.has(outer.name)) return 'not_sent';
  if (inner.errno !== undefined && NOT_SENT_ERRNOS.has(inner.errno)) return 'not_sent';
  if (inner.code && NOT_SENT_CODES.has(inner.code)) return 'not_sent';
  // 1180: "Got error during COMMIT" (a commit racing a node shutdown); 2013/2006: server gone; fatal: socket closed.
  if (inner.errno === 1180 || inner.errno === 2013 || inner.errno === 2006 || inner.fatal === true) return 'lost';
  if (inner.code === 'ECONNRESET' || inner.code === 'EPIPE') return 'lost';
  return null;
}

/** 409 after the last attempt of a transaction that kept meeting concurrent writes. */
export class WriteConflictError extends AppError {
  constructor(cause: unknown) {
    super('write_conflict', 'Someone else changed the same data at the same moment. Try again.', 409, { cause });
  }
}

/** 503 when no database server could run the request. */
export class DbUnavailableError extends AppError {
  constructor(cause: unknown) {
    super('db_unavailable', 'The database is not reachable. Try again shortly.', 503, { cause });
  }
}

/** 503 when the server went away while a change was being committed: it may or may not have been saved. */
export class DbOutcomeUnknownError extends AppError {
  constructor(cause: unknown) {
    super(
      'db_outcome_unknown',
      'The database went away while saving. Reload to see whether the change was saved before you try again.',
      503,
      { cause },
    );
  }
}

/**
 * Thrown by code inside a transaction to ask for the whole transaction to run again after a short wait
 * (e.g. the content registry while another process finishes removing the same bytes).
 */
export class RetryTransactionError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'RetryTransactionError';
  }
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Wait before attempt `attempt + 1` (attempt counts from 1): short for conflicts, longer for a server that went away. */
export function retryDelayMs(kind: DbFailureKind | 'busy', attempt: number): number {
  const base = kind === 'conflict' ? 15 : kind === 'busy' ? 100 : 250;
  const cap = kind === 'conflict' ? 400 : 2000;
  const exp = Math.min(cap, base * 2 ** (attempt - 1));
  // Jitter spreads the retries of writers that collided, so they do not collide again.
  return Math.round(exp / 2 + Math.random() * (exp / 2));
}

/** The error to give up with after the last attempt. */
function finalError(kind: DbFailureKind | 'busy', err: unknown): unknown {
  if (kind === 'conflict' || kind === 'busy') return new WriteConflictError(err);
  return new DbUnavailableError(err);
}

type AnyTransactionCallback<T> = (t: Transaction) => PromiseLike<T>;

/**
 * Makes `sequelize.transaction(callback)` run the whole callback again on a write conflict or a lost server (before
 * COMMIT), and single statements outside transactions again where that is safe. Exported for tests.
 */
export function installRetries(sequelize: Sequelize, attempts: number): void {
  const originalTransaction = sequelize.transaction.bind(sequelize) as (options?: TransactionOptions) => Promise<Transaction>;
  const originalQuery = sequelize.query.bind(sequelize) as (sql: unknown, options?: Record<string, unknown>) => Promise<unknown>;

  async function runManaged<T>(options: TransactionOptions, callback: AnyTransactionCallback<T>): Promise<T> {
    for (let attempt = 1; ; attempt += 1) {
      let phase: 'begin' | 'body' | 'commit' = 'begin';
      let transaction: Transaction | undefined;
      try {
        transaction = await originalTransaction(options);
        phase = 'body';
        let result: T;
        try {
          result = await callback(transaction);
        } catch (err) {
          await transaction.rollback().catch(() => undefined);
          throw err;
        }
        phase = 'commit';
        await transaction.commit();
        return result;
      } catch (err) {
        const kind: DbFailureKind | 'busy' | null = err instanceof RetryTransactionError ? 'busy' : classifyDbError(err);
        if (kind === null) throw err;
        // A COMMIT that lost its server may have been applied: running the transaction again could apply it twice.
        if (phase === 'commit' && kind === 'lost') throw new DbOutcomeUnknownError(err);
        if (attempt >= attempts) {
          logger.warn({ err, kind, attempt, phase }, 'transaction given up');
          throw finalError(kind, err);
        }
        logger.info({ kind, attempt, phase, message: (err as Error).message }, 'transaction will run again');
        await sleep(retryDelayMs(kind, attempt));
      }
    }
  }

  const transaction = ((optionsOrCallback?: TransactionOptions | AnyTransactionCallback<unknown>, maybeCallback?: unknown) => {
    const options = typeof optionsOrCallback === 'function' ? {} : (optionsOrCallback ?? {});
    const callback = (typeof optionsOrCallback === 'function' ? optionsOrCallback : maybeCallback) as
      AnyTransactionCallback<unknown> | undefined;
    // Unmanaged transactions (no callback) are the caller's to retry.
    if (!callback) return originalTransaction(options);
    return runManaged(options, callback);
  }) as Sequelize['transaction'];

  const query = (async (sql: unknown, options?: Record<string, unknown>) => {
    // Statements inside a transaction are retried with the whole transaction, never alone: after 1213 the
    // transaction is already rolled back and a lone retry would run outside it.
    if (options?.transaction) return originalQuery(sql, options);
    const text = typeof sql === 'string' ? sql : String((sql as { query?: string })?.query ?? '');
    const isRead = options?.type === 'SELECT' || /^\s*(SELECT|SHOW)\b/i.test(text);
    for (let attempt = 1; ; attempt += 1) {
      try {
        return await originalQuery(sql, options);
      } catch (err) {
        const kind = classifyDbError(err);
        if (kind === null) throw err;
        if (kind === 'lost' && !isRead) throw new DbOutcomeUnknownError(err);
        if (attempt >= attempts) throw finalError(kind, err);
        await sleep(retryDelayMs(kind, attempt));
      }
    }
  }) as Sequelize['query'];

  Object.assign(sequelize, { transaction, query });
}

/** A node that failed is skipped this long (unless every other one fails too). */
const NODE_QUARANTINE_MS = 3000;

/**
 * The mariadb driver with a `createConnection` that tries `nodes` in order: the first that accepts the connection and,
 * on a Galera node, is synced and ready, wins; a node that failed recently goes last. Every connection to a Galera
 * node gets `wsrep_sync_wait`. Connections whose node answers 1047 are closed so the pool replaces them.
 * Sequelize uses it through its `dialectModule` option.
 */
export function failoverDriver(nodes: DbNode[], options: { syncWait: number; connectTimeoutMs?: number }): typeof mariadb {
  const failedAt = new Map<number, number>();
  async function createConnection(config: ConnectionConfig): Promise<Connection> {
    const now = Date.now();
    const order = nodes
      .map((node, index) => ({ node, index, quarantined: now - (failedAt.get(index) ?? 0) < NODE_QUARANTINE_MS }))
      .sort((a, b) => Number(a.quarantined) - Number(b.quarantined) || a.index - b.index);
    const problems: string[] = [];
    let lastError: unknown;
    for (const { node, index } of order) {
      let connection: Connection | undefined;
      try {
        connection = await mariadb.createConnection({
          ...config,
          host: node.host,
          port: node.port,
          connectTimeout: options.connectTimeoutMs ?? 1500,
        });
        const status = (await connection.query(
          "SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_local_state', 'wsrep_ready', 'wsrep_cluster_status')",
        )) as Array<{ Variable_name: string; Value: string }>;
        const value = (name: string) => status.find((row) => row.Variable_name === name)?.Value;
        const isGalera = value('wsrep_local_state') !== undefined;
        if (isGalera) {
          if (value('wsrep_local_state') !== '4' || value('wsrep_ready') !== 'ON' || value('wsrep_cluster_status') !== 'Primary') {
            throw Object.assign(new Error(`node ${node.host}:${node.port} is not synced (state ${value('wsrep_local_state')})`), {
              errno: 1047,
            });
          }
          if (options.syncWait > 0) await connection.query(`SET SESSION wsrep_sync_wait = ${Number(options.syncWait)}`);
        }
        failedAt.delete(index);
        return guardConnection(connection);
      } catch (err) {
        failedAt.set(index, Date.now());
        lastError = err;
        problems.push(`${node.host}:${node.port}: ${(err as Error).message}`);
        if (connection) await connection.end().catch(() => connection?.destroy());
      }
    }
    logger.warn({ problems }, 'no database node accepted a connection');
    throw lastError instanceof Error ? lastError : new Error(problems.join('; '));
  }
  return Object.assign(Object.create(mariadb) as typeof mariadb, mariadb, { createConnection });
}

/** Closes a connection whose node stopped serving (1047), so the pool drops it instead of handing it out again. */
function guardConnection(connection: Connection): Connection {
  const query = connection.query.bind(connection);
  connection.query = (async (...args: Parameters<typeof query>) => {
    try {
      return await query(...args);
    } catch (err) {
      if ((err as DriverError).errno === 1047) connection.destroy();
      throw err;
    }
  }) as typeof connection.query;
  return connection;
}

/**
 * Creates a Sequelize instance for a MariaDB database (one server, a primary with read replicas, or a Galera cluster,
 * see the top of this file). Used directly by scripts and test setup (which need other databases than the app's);
 * the app itself goes through getSequelize().
 */
export function createSequelize(db: AppConfig['db']): Sequelize {
  const nodes = db.nodes?.length ? db.nodes : [{ host: db.host, port: db.port }];
  const replicas = db.readReplicas ?? [];
  const options: Options = {
    dialect: 'mariadb',
    host: nodes[0].host,
    port: nodes[0].port,
    logging: false,
    timezone: '+00:00',
    pool: { max: db.poolMax, min: 0, idle: 10_000, acquire: 20_000 },
    dialectOptions: { connectTimeout: 5000, timezone: 'Etc/UTC' },
    define: { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', underscored: true },
  };
  if (replicas.length) {
    // Primary + read replicas: Sequelize keeps one pool per side and sends reads outside transactions to the replicas.
    options.replication = {
      write: { host: nodes[0].host, port: nodes[0].port },
      read: replicas.map((r) => ({ host: r.host, port: r.port })),
    };
  } else if (nodes.length > 1) {
    options.dialectModule = failoverDriver(nodes, { syncWait: db.syncWait ?? 1 });
  }
  const sequelize = new Sequelize(db.name, db.user, db.password, options);
  installRetries(sequelize, db.retryAttempts ?? 6);
  return sequelize;
}

/**
 * The single Sequelize instance of this process, with every model initialised on it. Its `transaction` and `query`
 * are wrapped twice: createSequelize installs the retries, then the guard goes around them, so one managed
 * transaction is one guarded scope however many times the retry runs its callback, and a stray query inside any
 * attempt is caught before it reaches the pool.
 */
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
