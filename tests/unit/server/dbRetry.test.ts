import net from 'node:net';
import type { Sequelize, Transaction } from 'sequelize';
import { describe, expect, it } from 'vitest';
import {
  classifyDbError,
  createSequelize,
  DbOutcomeUnknownError,
  DbUnavailableError,
  guardTransactions,
  installRetries,
  RetryTransactionError,
  TransactionMisuseError,
  WriteConflictError,
} from '../../../server/db';

process.env.DB_PASSWORD ??= 'unit-test-password';
process.env.JWT_SECRET ??= 'Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw';
process.env.LOG_LEVEL ??= 'silent';

/** A driver error as the mariadb package raises it, wrapped the way Sequelize wraps query errors. */
function dbError(fields: { errno?: number; sqlState?: string; code?: string; fatal?: boolean }, name = 'SequelizeDatabaseError') {
  const parent = Object.assign(new Error(`driver error ${fields.errno ?? fields.code}`), fields);
  return Object.assign(new Error(parent.message), { name, parent, original: parent });
}

const DEADLOCK = () => dbError({ errno: 1213, sqlState: '40001' });
const NOT_READY = () => dbError({ errno: 1047, sqlState: '08S01' });
const SOCKET_CLOSED = () => dbError({ errno: 45009, sqlState: '08S01', fatal: true });

/**
 * A stand-in for Sequelize's transaction and query methods: each call takes the next scripted outcome. It records
 * what ran, so a test can tell a whole transaction run again from a single statement run again.
 */
function fakeSequelize(script: { begin?: unknown[]; commit?: unknown[]; query?: unknown[] }) {
  const log: string[] = [];
  const next = (list: unknown[] | undefined) => list?.shift();
  const fake = {
    async transaction() {
      const failure = next(script.begin);
      if (failure) throw failure;
      log.push('begin');
      return {
        async commit() {
          const fail = next(script.commit);
          log.push(fail ? 'commit failed' : 'commit');
          if (fail) throw fail;
        },
        async rollback() {
          log.push('rollback');
        },
      } as unknown as Transaction;
    },
    async query(sql: string) {
      const failure = next(script.query);
      log.push(`query ${sql}${failure ? ' failed' : ''}`);
      if (failure) throw failure;
      return [[{ ok: 1 }], 1];
    },
  };
  installRetries(fake as unknown as Sequelize, 3);
  return { db: fake as unknown as Sequelize, log };
}

describe('classifyDbError', () => {
  it.each([
    ['a deadlock / certification failure (1213)', 'conflict', DEADLOCK()],
    ['SQLSTATE 40001 alone', 'conflict', dbError({ sqlState: '40001' })],
    ['a node not ready (1047)', 'not_ready', NOT_READY()],
    ['a refused connection', 'not_sent', dbError({ code: 'ECONNREFUSED' }, 'SequelizeConnectionRefusedError')],
    ['a command on a connection already closed (45013)', 'not_sent', dbError({ errno: 45013, fatal: true })],
    ['a socket closed during a statement (45009)', 'lost', SOCKET_CLOSED()],
    ['an error during COMMIT (1180)', 'lost', dbError({ errno: 1180 })],
    ['a reset connection', 'lost', dbError({ code: 'ECONNRESET' })],
  ])('when the error is %s, then it is %s', (_what, kind, err) => {
    expect(classifyDbError(err)).toBe(kind);
  });

  it.each([
    ['a duplicate key (1062)', dbError({ errno: 1062, sqlState: '23000' })],
    ['a trigger refusal (1644)', dbError({ errno: 1644, sqlState: '45000' })],
    ['a plain error', new Error('boom')],
    ['nothing', undefined],
  ])('when the error is %s, then it is not retried (null)', (_what, err) => {
    expect(classifyDbError(err)).toBeNull();
  });
});

describe('installRetries (managed transactions)', () => {
  it('when the body meets a write conflict once, then the whole transaction runs again and its result is returned', async () => {
    // Arrange
    const { db, log } = fakeSequelize({});
    let runs = 0;
    // Act
    const result = await db.transaction(async () => {
      runs += 1;
      if (runs === 1) throw DEADLOCK();
      return 'saved';
    });
    // Assert
    expect(result).toBe('saved');
    expect(runs).toBe(2);
    expect(log).toEqual(['begin', 'rollback', 'begin', 'commit']);
  });

  it('when COMMIT fails certification, then the transaction runs again from the start', async () => {
    const { db, log } = fakeSequelize({ commit: [DEADLOCK()] });
    let runs = 0;
    const result = await db.transaction(async () => ++runs);
    expect(result).toBe(2);
    expect(log).toEqual(['begin', 'commit failed', 'begin', 'commit']);
  });

  it('when the server goes away during COMMIT, then the outcome is unknown (503) and nothing runs again', async () => {
    const { db, log } = fakeSequelize({ commit: [SOCKET_CLOSED()] });
    let runs = 0;
    const outcome = await db.transaction(async () => ++runs).catch((err: unknown) => err);
    expect(outcome).toBeInstanceOf(DbOutcomeUnknownError);
    expect(outcome).toMatchObject({ status: 503, code: 'db_outcome_unknown' });
    expect(runs).toBe(1);
    expect(log).toEqual(['begin', 'commit failed']);
  });

  it('when the server goes away before COMMIT, then the transaction runs again (it was rolled back)', async () => {
    const { db } = fakeSequelize({ begin: [dbError({ code: 'ECONNREFUSED' }, 'SequelizeConnectionRefusedError')] });
    let runs = 0;
    const result = await db.transaction(async () => {
      runs += 1;
      if (runs === 1) throw SOCKET_CLOSED();
      return runs;
    });
    expect(result).toBe(2);
  });

  it('when conflicts go on past the last attempt, then 409 write_conflict', async () => {
    const { db, log } = fakeSequelize({});
    const outcome = await db
      .transaction(async () => {
        throw DEADLOCK();
      })
      .catch((err: unknown) => err);
    expect(outcome).toBeInstanceOf(WriteConflictError);
    expect(outcome).toMatchObject({ status: 409, code: 'write_conflict' });
    expect(log.filter((l) => l === 'begin')).toHaveLength(3);
  });

  it('when the node stays unready past the last attempt, then 503 db_unavailable', async () => {
    const { db } = fakeSequelize({});
    const outcome = await db
      .transaction(async () => {
        throw NOT_READY();
      })
      .catch((err: unknown) => err);
    expect(outcome).toBeInstanceOf(DbUnavailableError);
    expect(outcome).toMatchObject({ status: 503, code: 'db_unavailable' });
  });

  it('when the body asks to run again (RetryTransactionError), then it does, and gives up as a conflict', async () => {
    const { db } = fakeSequelize({});
    let runs = 0;
    const outcome = await db
      .transaction(async () => {
        runs += 1;
        throw new RetryTransactionError('busy');
      })
      .catch((err: unknown) => err);
    expect(runs).toBe(3);
    expect(outcome).toBeInstanceOf(WriteConflictError);
  });

  it('when the body fails for any other reason, then it is not run again', async () => {
    const { db } = fakeSequelize({});
    let runs = 0;
    const outcome = await db
      .transaction(async () => {
        runs += 1;
        throw new Error('validation');
      })
      .catch((err: unknown) => err);
    expect(runs).toBe(1);
    expect((outcome as Error).message).toBe('validation');
  });
});

describe('guardTransactions around installRetries (as getSequelize wires them)', () => {
  it('when a guarded transaction meets a write conflict, then the whole transaction runs again inside the guard', async () => {
    // Arrange
    const { db, log } = fakeSequelize({});
    guardTransactions(db, 'throw');
    let runs = 0;
    // Act
    const result = await db.transaction(async (transaction) => {
      runs += 1;
      await db.query('UPDATE designs', { transaction });
      if (runs === 1) throw DEADLOCK();
      return 'saved';
    });
    // Assert
    expect(result).toBe('saved');
    expect(log).toEqual(['begin', 'query UPDATE designs', 'rollback', 'begin', 'query UPDATE designs', 'commit']);
  });

  it('when the attempt after a conflict queries beside its transaction, then the guard still refuses it, and afterwards a query on its own is fine', async () => {
    // Arrange
    const { db, log } = fakeSequelize({});
    guardTransactions(db, 'throw');
    let runs = 0;
    // Act
    const outcome = await db
      .transaction(async () => {
        runs += 1;
        if (runs === 1) throw DEADLOCK();
        return db.query('SELECT stray');
      })
      .catch((err: unknown) => err);
    const after = await db.query('SELECT after');
    // Assert
    expect(runs).toBe(2);
    expect(outcome).toBeInstanceOf(TransactionMisuseError);
    expect(log).toEqual(['begin', 'rollback', 'begin', 'rollback', 'query SELECT after']);
    expect(after).toEqual([[{ ok: 1 }], 1]);
  });
});

describe('installRetries (statements outside transactions)', () => {
  it('when a read loses its connection, then it is sent again', async () => {
    const { db, log } = fakeSequelize({ query: [SOCKET_CLOSED()] });
    await db.query('SELECT 1');
    expect(log).toEqual(['query SELECT 1 failed', 'query SELECT 1']);
  });

  it('when a write loses its connection, then it is not sent again: the outcome is unknown (503)', async () => {
    const { db, log } = fakeSequelize({ query: [SOCKET_CLOSED()] });
    const outcome = await db.query('UPDATE designs SET version = 2 WHERE id = 1 AND version = 1').catch((err: unknown) => err);
    expect(outcome).toBeInstanceOf(DbOutcomeUnknownError);
    expect(log).toHaveLength(1);
  });

  it('when a write meets a conflict or an unready node, then it is sent again (it was not applied)', async () => {
    const { db, log } = fakeSequelize({ query: [DEADLOCK(), NOT_READY()] });
    await db.query('UPDATE mail_queue SET claim_token = 1');
    expect(log).toHaveLength(3);
  });

  it('when a statement belongs to a transaction, then it is never sent again on its own', async () => {
    const { db, log } = fakeSequelize({ query: [DEADLOCK()] });
    const outcome = await db.query('UPDATE x SET y = 1', { transaction: {} as Transaction }).catch((err: unknown) => err);
    expect(classifyDbError(outcome)).toBe('conflict');
    expect(log).toHaveLength(1);
  });
});

describe('createSequelize', () => {
  const base = { host: '127.0.0.1', port: 3407, name: 'gw', user: 'gw', password: 'secret-password', poolMax: 2 };

  it('when read replicas are configured, then reads go to a read pool of the replicas and writes to the primary', async () => {
    const db = createSequelize({
      ...base,
      readReplicas: [
        { host: 'replica-1.example.test', port: 3307 },
        { host: 'replica-2.example.test', port: 3308 },
      ],
    });
    const replication = db.options.replication as { read: Array<{ host: string; port: number }>; write: { host: string; port: number } };
    expect(replication.write).toEqual({ host: '127.0.0.1', port: 3407 });
    expect(replication.read).toEqual([
      { host: 'replica-1.example.test', port: 3307 },
      { host: 'replica-2.example.test', port: 3308 },
    ]);
    await db.close();
  });

  it('when several cluster nodes are configured and the first refuses, then the connection is tried on the second', async () => {
    // Arrange: the first node's port has nobody listening; the second is a bare TCP listener that notes the call and hangs up
    const closed = net.createServer();
    await new Promise<void>((resolve) => closed.listen(0, '127.0.0.1', resolve));
    const refusedPort = (closed.address() as net.AddressInfo).port;
    await new Promise<void>((resolve) => closed.close(() => resolve()));
    let reached = 0;
    const listener = net.createServer((socket) => {
      reached++;
      socket.destroy();
    });
    await new Promise<void>((resolve) => listener.listen(0, '127.0.0.1', resolve));
    const listeningPort = (listener.address() as net.AddressInfo).port;
    const db = createSequelize({
      ...base,
      nodes: [
        { host: '127.0.0.1', port: refusedPort },
        { host: '127.0.0.1', port: listeningPort },
      ],
    });
    const driver = (db.options as { dialectModule?: { createConnection: (c: object) => Promise<unknown> } }).dialectModule!;
    // Act: the listener hangs up without a greeting, so the attempt fails after reaching it
    const outcome = await driver.createConnection({ user: 'x', password: 'y', database: 'z' }).catch((err: Error) => err);
    // Assert
    expect(outcome).toBeInstanceOf(Error);
    expect(reached).toBe(1);
    expect(db.options.replication).toBeFalsy();
    await new Promise<void>((resolve) => listener.close(() => resolve()));
    await db.close();
  }, 15_000);

  it('when one server is configured, then the stock driver is used', async () => {
    const db = createSequelize(base);
    expect((db.options as { dialectModule?: unknown }).dialectModule ?? null).toBeNull();
    await db.close();
  });
});
