import { randomBytes } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { getSequelize, RetryTransactionError } from '../db';
import { logger } from '../logger';
import type { ContentStore } from './contentStore';

/**
 * When may stored bytes go? Content is shared by hash (two uploads of the same file, a sheet attached to a design),
 * so bytes may only be removed once no attachment, recording or sheet refers to them — and that decision must hold
 * with several app processes and several database nodes. Row locks cannot carry it on a Galera cluster (they are
 * local to one node), so the table `stored_contents` has one row per hash that every party WRITES, and Galera's
 * certification (or InnoDB's row lock on one server) orders those writes:
 *
 * - A transaction that adds a reference calls {@link referenceContent} (row → `live`) and then puts the bytes. If a
 *   remover currently holds the row (`removing`, lease not expired) the whole transaction waits and runs again.
 * - Deleting a reference leaves a hint: {@link markUnreferenced} turns the row `orphan` when nothing refers to it.
 * - {@link removeUnreferencedContent} claims an orphan (conditional UPDATE with a random token and a lease),
 *   commits, counts the references afresh (reads wait for every earlier commit: `wsrep_sync_wait`), and only then
 *   removes the bytes and the row. A referencing transaction that raced the claim either committed first (the
 *   claim then fails certification or finds the row `live`) or sees the claim and waits; so bytes that something
 *   refers to are never removed. A remover that crashed leaves its claim to expire; the next one takes it over.
 */

/** How long a remover holds a claimed row; it removes bytes only while at least half of this is left. */
const CLAIM_LEASE_MS = 60_000;

type RegistryRow = { state: 'live' | 'orphan' | 'removing'; claimed_until: Date | string | null };

const toDate = (value: Date | string): Date => (value instanceof Date ? value : new Date(`${value.replace(' ', 'T')}Z`));

/** `transaction.sequelize` when given (seeders use their own instance), else the app's. */
function dbOf(transaction?: Transaction): Sequelize {
  return (transaction as (Transaction & { sequelize?: Sequelize }) | undefined)?.sequelize ?? getSequelize();
}

/** How many attachments, recordings and sheets refer to `sha256` (in `transaction` when given). */
export async function countReferences(sha256: string, transaction?: Transaction): Promise<number> {
  const rows = await dbOf(transaction).query<{ refs: number | string }>(
    'SELECT (SELECT COUNT(*) FROM attachments WHERE sha256 = :h) + (SELECT COUNT(*) FROM measurements WHERE recording_sha256 = :h) + ' +
      '(SELECT COUNT(*) FROM sheets WHERE a4_sha256 = :h OR letter_sha256 = :h) AS refs',
    { replacements: { h: sha256 }, type: QueryTypes.SELECT, transaction },
  );
  return Number(rows[0]?.refs ?? 0);
}

/**
 * Records, in the transaction that adds a reference to `sha256`, that the bytes are in use. Call it before putting
 * the bytes. @throws RetryTransactionError while another process is removing the same bytes (the transaction
 * wrapper runs the whole transaction again shortly).
 */
export async function referenceContent(sha256: string, size: number, transaction: Transaction): Promise<void> {
  const db = dbOf(transaction);
  const now = new Date();
  const rows = await db.query<RegistryRow>('SELECT state, claimed_until FROM stored_contents WHERE sha256 = ? FOR UPDATE', {
    replacements: [sha256],
    type: QueryTypes.SELECT,
    transaction,
  });
  const row = rows[0];
  if (row?.state === 'removing' && row.claimed_until && toDate(row.claimed_until) > now) {
    throw new RetryTransactionError(`content ${sha256.slice(0, 12)}… is being removed by another process`);
  }
  await db.query(
    'INSERT INTO stored_contents (sha256, size, state, orphan_since, claim_token, claimed_until, created_at, updated_at) ' +
      "VALUES (?, ?, 'live', NULL, NULL, NULL, ?, ?) " +
      "ON DUPLICATE KEY UPDATE state = 'live', orphan_since = NULL, claim_token = NULL, claimed_until = NULL, size = VALUES(size), updated_at = VALUES(updated_at)",
    { replacements: [sha256, size, now, now], transaction },
  );
}

/**
 * After references to `sha256` were deleted (in `transaction`, or on their own): marks the bytes `orphan` when nothing
 * refers to them any more, for {@link removeUnreferencedContent}. @returns whether they are orphaned now.
 */
export async function markUnreferenced(sha256: string, transaction?: Transaction): Promise<boolean> {
  const db = dbOf(transaction);
  if ((await countReferences(sha256, transaction)) > 0) return false;
  const now = new Date();
  // MariaDB applies the assignments left to right: orphan_since still sees the old state.
  await db.query(
    'INSERT INTO stored_contents (sha256, size, state, orphan_since, claim_token, claimed_until, created_at, updated_at) ' +
      "VALUES (?, NULL, 'orphan', ?, NULL, NULL, ?, ?) " +
      "ON DUPLICATE KEY UPDATE orphan_since = IF(state = 'live', VALUES(orphan_since), orphan_since), state = IF(state = 'live', 'orphan', state), updated_at = VALUES(updated_at)",
    { replacements: [sha256, now, now, now], transaction },
  );
  return true;
}

/** Affected rows of an UPDATE/DELETE through Sequelize's mariadb dialect. */
function affectedRows(result: unknown): number {
  if (Array.isArray(result)) return affectedRows(result[1] ?? result[0]);
  if (typeof result === 'number') return result;
  if (result && typeof result === 'object' && 'affectedRows' in result) return Number((result as { affectedRows: number }).affectedRows);
  return 0;
}

/**
 * Removes the bytes of each orphaned hash that nothing refers to, under a claim (see the top of this file).
 * Never throws: a failure leaves the bytes for the next sweep and is logged.
 * @returns how many were removed
 */
export async function removeUnreferencedContent(
  sha256s: readonly string[],
  store: ContentStore,
  db: Sequelize = getSequelize(),
): Promise<number> {
  let removed = 0;
  for (const sha256 of new Set(sha256s)) {
    try {
      if (await removeOne(sha256, store, db)) removed += 1;
    } catch (err) {
      logger.warn({ err, sha256 }, 'could not remove unreferenced stored bytes; the sweeper tries again');
    }
  }
  return removed;
}

async function removeOne(sha256: string, store: ContentStore, db: Sequelize): Promise<boolean> {
  const token = randomBytes(16).toString('hex');
  const now = new Date();
  const leaseEnd = new Date(now.getTime() + CLAIM_LEASE_MS);
  const claimed = affectedRows(
    await db.query(
      "UPDATE stored_contents SET state = 'removing', claim_token = ?, claimed_until = ?, updated_at = ? " +
        "WHERE sha256 = ? AND (state = 'orphan' OR (state = 'removing' AND claimed_until < ?))",
      { replacements: [token, leaseEnd, now, sha256, now], type: QueryTypes.UPDATE },
    ),
  );
  if (claimed !== 1) return false;
  // The claim is committed: from here on no new reference can commit until we release the row.
  if ((await countReferences(sha256)) > 0) {
    await db.query(
      "UPDATE stored_contents SET state = 'live', orphan_since = NULL, claim_token = NULL, claimed_until = NULL, updated_at = ? WHERE sha256 = ? AND claim_token = ?",
      { replacements: [new Date(), sha256, token], type: QueryTypes.UPDATE },
    );
    return false;
  }
  if (Date.now() > leaseEnd.getTime() - CLAIM_LEASE_MS / 2) {
    logger.warn({ sha256 }, 'content removal took too long; leaving the claim to expire');
    return false;
  }
  const existed = await store.remove(sha256);
  await db.query('DELETE FROM stored_contents WHERE sha256 = ? AND claim_token = ?', {
    replacements: [sha256, token],
    type: QueryTypes.DELETE,
  });
  return existed;
}

/**
 * One pass of the sweeper: removes bytes orphaned at least `minAgeMs` ago (left by a process that stopped between
 * a delete and the removal) and takes over expired claims. @returns how many were removed
 */
export async function sweepOrphans(store: ContentStore, options: { minAgeMs?: number; limit?: number } = {}): Promise<number> {
  const db = getSequelize();
  const now = Date.now();
  const rows = await db.query<{ sha256: string }>(
    "SELECT sha256 FROM stored_contents WHERE (state = 'orphan' AND orphan_since <= ?) OR (state = 'removing' AND claimed_until < ?) LIMIT ?",
    { replacements: [new Date(now - (options.minAgeMs ?? 60_000)), new Date(now), options.limit ?? 50], type: QueryTypes.SELECT },
  );
  return removeUnreferencedContent(
    rows.map((r) => r.sha256),
    store,
    db,
  );
}

/**
 * How old unregistered bytes must be before the sweep takes them for strays: far longer than any transaction that
 * puts bytes and then commits their row (seconds), so bytes whose transaction is still running are never touched.
 */
const STRAY_MIN_AGE_MS = 60 * 60_000;

/** What one pass over the whole store found. */
interface StraySweep {
  /** Stored contents looked at. */
  checked: number;
  /** Of those, old enough and without a row in `stored_contents`: registered as orphans. */
  strays: number;
  /** Removed (a stray that something refers to after all is kept and its row made `live`). */
  removed: number;
  /** Leftovers of interrupted writes removed (the local folder's temporary files). */
  leftovers: number;
}

/**
 * Finds bytes in the store that nothing registered: a process that died after putting them and before its
 * transaction committed leaves bytes with no `stored_contents` row, which no delete will ever mark. Each stored
 * hash at least `minAgeMs` old without a row gets an `orphan` row (INSERT IGNORE: a row that appeared meanwhile, or
 * a transaction still writing one, wins), and then goes through the same claimed removal as every orphan, which
 * counts the references afresh. A reference added at the same moment is safe for the reasons given at the top of
 * this file: it turns the row `live`, or waits for the removal and puts the bytes again. Temporary files of writes
 * that never finished, as old, go too.
 * @param options.minAgeMs - youngest bytes taken for strays (default {@link STRAY_MIN_AGE_MS})
 * @param options.pageSize - hashes listed and looked up at a time
 * @returns how many contents were checked, registered and removed, and how many leftovers went
 */
export async function sweepStrays(store: ContentStore, options: { minAgeMs?: number; pageSize?: number } = {}): Promise<StraySweep> {
  const db = getSequelize();
  const oldest = Date.now() - (options.minAgeMs ?? STRAY_MIN_AGE_MS);
  const result: StraySweep = { checked: 0, strays: 0, removed: 0, leftovers: 0 };
  result.leftovers = (await store.removeLeftovers?.(new Date(oldest))) ?? 0;
  let after: string | undefined;
  for (;;) {
    const page = await store.list({ after, limit: options.pageSize ?? 500 });
    result.checked += page.items.length;
    const old = page.items.filter((i) => i.storedAt.getTime() <= oldest).map((i) => i.sha256);
    if (old.length > 0) {
      const known = await db.query<{ sha256: string }>('SELECT sha256 FROM stored_contents WHERE sha256 IN (?)', {
        replacements: [old],
        type: QueryTypes.SELECT,
      });
      const registered = new Set(known.map((r) => r.sha256));
      const strays = old.filter((h) => !registered.has(h));
      const now = new Date();
      for (const sha256 of strays) {
        await db.query(
          'INSERT IGNORE INTO stored_contents (sha256, size, state, orphan_since, claim_token, claimed_until, created_at, updated_at) ' +
            "VALUES (?, NULL, 'orphan', ?, NULL, NULL, ?, ?)",
          { replacements: [sha256, now, now, now] },
        );
      }
      if (strays.length > 0) {
        logger.info({ count: strays.length }, 'stored bytes without a registry row found; removing those nothing refers to');
        result.strays += strays.length;
        result.removed += await removeUnreferencedContent(strays, store, db);
      }
    }
    if (!page.next) return result;
    after = page.next;
  }
}

/**
 * Runs {@link sweepOrphans} periodically in this process (every process may: rows are claimed), and every
 * `strayEvery`-th time (the first a minute after start) {@link sweepStrays}, which lists the whole store.
 * @returns stop()
 */
export function startContentSweeper(store: () => ContentStore, intervalMs = 5 * 60_000, strayEvery = 12): () => void {
  let isRunning = false;
  let ticks = 0;
  const run = async (withStrays: boolean) => {
    if (isRunning) return;
    isRunning = true;
    try {
      await sweepOrphans(store());
      if (withStrays) await sweepStrays(store());
    } catch (err) {
      logger.warn({ err }, 'content sweep failed');
    } finally {
      isRunning = false;
    }
  };
  const timer = setInterval(() => void run(++ticks % strayEvery === 0), intervalMs);
  timer.unref();
  const first = setTimeout(() => void run(true), Math.min(60_000, intervalMs));
  first.unref();
  return () => {
    clearInterval(timer);
    clearTimeout(first);
  };
}
