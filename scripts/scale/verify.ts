import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { CaughtMessage } from '../mailcatcher';
import type { ContentStore } from '../../server/storage';
import type { ContentionLedger, Ledger } from './journey';

/** One proof after the run: what was checked, whether it held, and the figures. */
export type Check = { name: string; ok: boolean; detail: string };

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

async function rows<T extends object>(db: Sequelize, sql: string, replacements: unknown[] = []): Promise<T[]> {
  return db.query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

/** Counts of `column` values in `table` among `values` (one query per chunk of ids). */
async function countBy(db: Sequelize, table: string, column: string, values: Array<string | number>): Promise<Map<string, number>> {
  const counts = new Map<string, number>();
  for (let i = 0; i < values.length; i += 500) {
    const chunk = values.slice(i, i + 500);
    if (!chunk.length) continue;
    const found = await rows<{ v: string | number; n: number | string }>(
      db,
      `SELECT ${column} AS v, COUNT(*) AS n FROM ${table} WHERE ${column} IN (?) GROUP BY ${column}`,
      [chunk],
    );
    for (const f of found) counts.set(String(f.v), Number(f.n));
  }
  return counts;
}

function exactlyOnce(name: string, keys: Array<string | number>, counts: Map<string, number>): Check {
  const missing = keys.filter((k) => !counts.get(String(k)));
  const doubled = keys.filter((k) => (counts.get(String(k)) ?? 0) > 1);
  return {
    name,
    ok: missing.length === 0 && doubled.length === 0,
    detail: `${keys.length} acknowledged, ${missing.length} missing, ${doubled.length} more than once${missing.length ? ` (missing: ${missing.slice(0, 5).join(', ')})` : ''}`,
  };
}

/**
 * The proofs after the run, against the database (as the owner account, through any node) and the object store:
 * every acknowledged write present exactly once, unanswered writes at most once, every sheet's bytes matching their
 * SHA-256, every queued mail sent exactly once, no lost update on the contended design, and the three nodes
 * holding the same data.
 */
export async function verifyRun(input: {
  db: Sequelize;
  /** One connection per node, to compare what each holds. */
  nodeDbs: Sequelize[];
  store: ContentStore;
  ledger: Ledger;
  contention: ContentionLedger;
  mails: CaughtMessage[];
  messageIdOf: (queueId: number) => string;
  /** `pid@host` of the app processes this run killed. */
  killedSenders: Set<string>;
}): Promise<Check[]> {
  const { db, ledger, store } = input;
  const checks: Check[] = [];

  // Designs: the unique name of each acknowledged create, exactly once, with the id the app answered.
  const designCounts = await countBy(
    db,
    'designs',
    'name',
    ledger.designs.map((d) => d.name),
  );
  checks.push(
    exactlyOnce(
      'acknowledged designs present exactly once',
      ledger.designs.map((d) => d.name),
      designCounts,
    ),
  );
  const idRows = await countBy(
    db,
    'designs',
    'id',
    ledger.designs.map((d) => d.id),
  );
  checks.push(
    exactlyOnce(
      'acknowledged design ids present',
      ledger.designs.map((d) => d.id),
      idRows,
    ),
  );

  // Saves: each design's stored version is at least the newest acknowledged one (a lost save would leave it lower).
  const newestSave = new Map<number, number>();
  for (const s of ledger.saves) newestSave.set(s.designId, Math.max(newestSave.get(s.designId) ?? 0, s.version));
  const versions = new Map<number, number>();
  const designIds = [...newestSave.keys()];
  for (let i = 0; i < designIds.length; i += 500) {
    for (const r of await rows<{ id: number; version: number }>(db, 'SELECT id, version FROM designs WHERE id IN (?)', [
      designIds.slice(i, i + 500),
    ])) {
      versions.set(Number(r.id), Number(r.version));
    }
  }
  const lostSaves = designIds.filter((id) => (versions.get(id) ?? 0) < newestSave.get(id)!);
  checks.push({
    name: 'acknowledged saves kept (optimistic lock, per design)',
    ok: lostSaves.length === 0,
    detail: `${ledger.saves.length} acknowledged saves on ${designIds.length} designs, ${lostSaves.length} designs behind their last acknowledged version`,
  });

  // Revisions and sheets.
  const revisionCounts = await countBy(
    db,
    'revisions',
    'id',
    ledger.submits.map((s) => s.revisionId),
  );
  checks.push(
    exactlyOnce(
      'acknowledged submissions (revisions) present exactly once',
      ledger.submits.map((s) => s.revisionId),
      revisionCounts,
    ),
  );
  const sheetPerRevision = await countBy(
    db,
    'sheets',
    'revision_id',
    ledger.approvals.map((a) => a.revisionId),
  );
  checks.push(
    exactlyOnce(
      'acknowledged approvals have exactly one sheet',
      ledger.approvals.map((a) => a.revisionId),
      sheetPerRevision,
    ),
  );
  const measurementCounts = await countBy(
    db,
    'measurements',
    'recording_sha256',
    ledger.measurements.map((m) => m.recordingSha256),
  );
  checks.push(
    exactlyOnce(
      'acknowledged pluck uploads (measurements) present exactly once',
      ledger.measurements.map((m) => m.recordingSha256),
      measurementCounts,
    ),
  );

  // Unanswered writes: applied or not, never twice.
  const unansweredDesigns = ledger.unanswered.filter((u) => u.kind === 'design').map((u) => u.mark);
  const unansweredRecordings = ledger.unanswered.filter((u) => u.kind === 'measurement').map((u) => u.mark);
  const unansweredDesignCounts = await countBy(db, 'designs', 'name', unansweredDesigns);
  const unansweredRecordingCounts = await countBy(db, 'measurements', 'recording_sha256', unansweredRecordings);
  const appliedUnanswered = [...unansweredDesignCounts.values(), ...unansweredRecordingCounts.values()];
  checks.push({
    name: 'unanswered writes applied at most once',
    ok: appliedUnanswered.every((n) => n <= 1),
    detail: `${ledger.unanswered.length} writes without a definite answer; of the ${unansweredDesigns.length + unansweredRecordings.length} creates among them, ${appliedUnanswered.length} were applied (once each), ${appliedUnanswered.filter((n) => n > 1).length} twice`,
  });

  // Downloads during the run matched their hash.
  const badDownloads = ledger.downloads.filter((d) => d.expected !== d.actual);
  checks.push({
    name: 'sheet downloads during the run matched their SHA-256',
    ok: badDownloads.length === 0,
    detail: `${ledger.downloads.length} downloads, ${badDownloads.length} mismatched`,
  });

  // Every sheet's bytes, A4 and Letter, re-read from the object store (or the row, for older sheets) and re-hashed.
  const sheets = await rows<{ id: number; a4_sha256: string; letter_sha256: string; a4_in_row: number; letter_in_row: number }>(
    db,
    'SELECT id, a4_sha256, letter_sha256, a4_pdf IS NOT NULL AS a4_in_row, letter_pdf IS NOT NULL AS letter_in_row FROM sheets',
  );
  let sheetFiles = 0;
  const badSheets: string[] = [];
  for (const s of sheets) {
    for (const [hash, inRow, column] of [
      [s.a4_sha256, Number(s.a4_in_row), 'a4_pdf'],
      [s.letter_sha256, Number(s.letter_in_row), 'letter_pdf'],
    ] as const) {
      sheetFiles += 1;
      try {
        const bytes = inRow
          ? (await rows<{ b: Buffer }>(db, `SELECT ${column} AS b FROM sheets WHERE id = ?`, [s.id]))[0].b
          : await store.get(hash);
        if (sha256(bytes) !== hash) badSheets.push(`${s.id}/${column}`);
      } catch (err) {
        badSheets.push(`${s.id}/${column} (${(err as Error).message})`);
      }
    }
  }
  const acknowledgedSheetIds = new Set(ledger.approvals.map((a) => a.sheetId));
  const presentSheetIds = new Set(sheets.map((s) => Number(s.id)));
  const missingSheets = [...acknowledgedSheetIds].filter((id) => !presentSheetIds.has(id));
  checks.push({
    name: "every sheet's bytes match their SHA-256",
    ok: badSheets.length === 0 && missingSheets.length === 0 && sheets.length > 0,
    detail: `${sheets.length} sheets, ${sheetFiles} PDF files re-hashed, ${badSheets.length} bad${badSheets.length ? ` (${badSheets.slice(0, 3).join('; ')})` : ''}, ${missingSheets.length} acknowledged sheets missing`,
  });

  // Every recording referenced by a measurement is in the store and matches its hash.
  const recordings = await rows<{ h: string }>(
    db,
    'SELECT DISTINCT recording_sha256 AS h FROM measurements WHERE recording_sha256 IS NOT NULL',
  );
  const badRecordings: string[] = [];
  for (const r of recordings) {
    try {
      await store.get(r.h, { verify: true });
    } catch (err) {
      badRecordings.push(`${r.h.slice(0, 12)}… ${(err as Error).message}`);
    }
  }
  checks.push({
    name: 'every stored recording present and matching its SHA-256',
    ok: badRecordings.length === 0,
    detail: `${recordings.length} recordings, ${badRecordings.length} bad`,
  });

  // Mail: every queued row sent, and the catcher holds exactly one message per row. The one exception SMTP cannot
  // avoid: a sender killed after the SMTP server took a mail but before the queue recorded it; its claim expires and
  // another process sends the mail again, with the same Message-ID. Such a repeat is allowed only when the first copy
  // came from a process this run killed, and it is reported.
  // A discarded row was built at sending time and had nobody to go to (a reset asked for an unknown address).
  const queue = await rows<{ id: number; status: string }>(db, "SELECT id, status FROM mail_queue WHERE status <> 'discarded'");
  const notSent = queue.filter((q) => q.status !== 'sent');
  const byMessageId = new Map<string, CaughtMessage[]>();
  for (const m of input.mails) if (m.messageId) byMessageId.set(m.messageId, [...(byMessageId.get(m.messageId) ?? []), m]);
  const expected = new Set(queue.map((q) => input.messageIdOf(Number(q.id))));
  const missingMail = queue.filter((q) => !byMessageId.get(input.messageIdOf(Number(q.id))));
  const repeated = [...byMessageId.entries()].filter(([id, copies]) => expected.has(id) && copies.length > 1);
  const explained = repeated.filter(
    ([, copies]) => copies.length === 2 && copies[0].sentBy !== null && input.killedSenders.has(copies[0].sentBy),
  );
  const strangers = [...byMessageId.keys()].filter((id) => !expected.has(id));
  checks.push({
    name: 'every queued mail sent exactly once',
    ok:
      queue.length > 0 &&
      notSent.length === 0 &&
      missingMail.length === 0 &&
      repeated.length === explained.length &&
      strangers.length === 0,
    detail:
      `${queue.length} queued, ${notSent.length} not sent, ${input.mails.length} received, ${missingMail.length} missing, ` +
      `${repeated.length - explained.length} sent twice, ${strangers.length} unknown` +
      (explained.length ? `; ${explained.length} sent again after the process that had sent it was killed before recording it` : ''),
  });

  // The contended design: no two saves acknowledged for the same version, and the history ends where the acks say.
  const { contention } = input;
  const [final] = await rows<{ version: number; name: string }>(db, 'SELECT version, name FROM designs WHERE id = ?', [
    contention.designId,
  ]);
  const ackVersions = contention.acks.map((a) => a.version);
  const duplicates = ackVersions.length - new Set(ackVersions).size;
  const maxAck = contention.acks.reduce(
    (best, a) => (a.version > (best?.version ?? 0) ? a : best),
    undefined as (typeof contention.acks)[number] | undefined,
  );
  const applied = Number(final.version) - contention.initialVersion;
  const endsRight = !maxAck || Number(final.version) > maxAck.version || final.name === maxAck.name;
  const writers = new Set(contention.acks.map((a) => a.writer)).size;
  checks.push({
    name: 'no lost update on one design saved through three processes and three nodes',
    ok:
      duplicates === 0 &&
      endsRight &&
      applied >= contention.acks.length &&
      applied <= contention.acks.length + contention.unanswered.length &&
      contention.acks.length > 0,
    detail: `${contention.acks.length} saves acknowledged by ${writers} editors, ${contention.conflicts} refused as stale (409), ${contention.unanswered.length} unanswered; version advanced by ${applied}; ${duplicates} versions acknowledged twice`,
  });

  // The nodes agree: same row counts and table checksums everywhere.
  const tables = ['users', 'designs', 'revisions', 'sheets', 'measurements', 'attachments', 'mail_queue', 'stored_contents', 'audit_log'];
  const perNode: string[][] = [];
  for (const nodeDb of input.nodeDbs) {
    const sums: string[] = [];
    for (const t of tables) {
      const [c] = await rows<{ Checksum: string | number }>(nodeDb, `CHECKSUM TABLE ${t}`);
      const [n] = await rows<{ n: number | string }>(nodeDb, `SELECT COUNT(*) AS n FROM ${t}`);
      sums.push(`${t}:${n.n}:${c.Checksum}`);
    }
    perNode.push(sums);
  }
  const differing = tables.filter((_, i) => new Set(perNode.map((p) => p[i])).size > 1);
  checks.push({
    name: 'the three database nodes hold the same data',
    ok: perNode.length === 3 && differing.length === 0,
    detail: `${tables.length} tables compared by row count and checksum on ${perNode.length} nodes${differing.length ? `; differ: ${differing.join(', ')}` : ''}`,
  });

  // No bytes in use left claimed for removal.
  const [stuck] = await rows<{ n: number | string }>(db, "SELECT COUNT(*) AS n FROM stored_contents WHERE state = 'removing'");
  checks.push({ name: 'no stored content stuck in removal', ok: Number(stuck.n) === 0, detail: `${stuck.n} rows in state removing` });

  return checks;
}
