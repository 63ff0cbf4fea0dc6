import { randomBytes } from 'node:crypto';
import { plural } from '@/format';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { getConfig } from '../config';
import { logger } from '../logger';
import { Notification } from '../models';
import { sendMail } from './mail.service';
import { escapeHtml, type MailContent } from './mailTemplates';
import { buildResetMail, RESET_MAIL_KIND } from './resetMail';

/**
 * E-mail notices of the review flow, through a mail queue in MariaDB (table `mail_queue`).
 *
 * A notice is written in the same transaction as the state change it announces, so a committed transition
 * always has its mail and a rolled-back one never does. After the commit the caller hands the new ids to
 * {@link deliverSoon}; anything not delivered then (SMTP down, process stopped) is picked up by the periodic
 * {@link startMailQueueWorker} with backoff. Rows are claimed with a conditional UPDATE that writes a random claim
 * token and a lease (`claim_token`, `locked_until`; {@link claimDueMail}), so any number of server processes, on any
 * database node, share the queue and each mail is sent once; a sender that crashed loses its rows when the lease
 * runs out. A mail failure never undoes a transition.
 */

/** Someone to notify. */
export type Recipient = { email: string; name: string };

/** Wait before the 2nd, 3rd, … attempt; after the last one the mail is marked `failed`. */
export const RETRY_BACKOFF_MS = [30_000, 2 * 60_000, 10 * 60_000, 30 * 60_000, 60 * 60_000, 2 * 60 * 60_000, 6 * 60 * 60_000];
/** Attempts before giving up (each attempt is itself sendMail's three quick tries). */
export const MAX_ATTEMPTS = RETRY_BACKOFF_MS.length + 1;
/**
 * Longest one sendMail call can take (three tries, each with 5 s connect + 5 s greeting + 10 s socket timeouts, and
 * the pauses between): a sender starts a mail only while at least this much of its lease is left, so a lease never
 * runs out while a mail is on its way.
 */
const LONGEST_SEND_MS = 65_000;
/** Rows claimed per pass of the worker. */
const BATCH_SIZE = 25;

/**
 * Writes one mail per recipient into the queue, in `transaction`. Duplicate addresses are sent once.
 * Rows are inserted one by one: ids on a database cluster step by the cluster size, so a bulk insert's ids cannot
 * be inferred from the first one.
 * @returns the ids of the queued rows, for {@link deliverSoon} after the commit
 */
export async function queueMail(
  kind: string,
  recipients: Recipient[],
  build: (recipient: Recipient) => MailContent,
  transaction?: Transaction,
): Promise<number[]> {
  const seen = new Set<string>();
  const unique = recipients.filter((r) => {
    const key = r.email.toLowerCase();
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  const now = new Date();
  const ids: number[] = [];
  for (const r of unique) {
    const content = build(r);
    const row = await Notification.create(
      {
        kind,
        toAddress: r.email,
        subject: content.subject.slice(0, 300),
        textBody: content.text,
        htmlBody: content.html,
        status: 'pending',
        attempts: 0,
        lastError: null,
        nextAttemptAt: now,
        lockedUntil: null,
        claimToken: null,
        sentAt: null,
      },
      { transaction },
    );
    ids.push(row.id);
  }
  return ids;
}

/** Affected rows of an UPDATE through Sequelize's mariadb dialect. */
function affectedRows(result: unknown): number {
  if (Array.isArray(result)) return affectedRows(result[1] ?? result[0]);
  if (typeof result === 'number') return result;
  if (result && typeof result === 'object' && 'affectedRows' in result) return Number((result as { affectedRows: number }).affectedRows);
  return 0;
}

/** Rows this sender holds: its token and until when. */
export type Claim = { token: string; until: Date; rows: Notification[] };

/**
 * Atomically takes due rows for this sender: ONE conditional UPDATE writes a fresh random token and the lease on
 * rows that are pending, due and not held by anyone (or whose holder's lease ran out), then the rows carrying the
 * token are read back. Two senders can never both hold a row: on one server the UPDATE's row locks order them, on a
 * Galera cluster the second commit fails certification and is retried (server/db.ts), finding the rows taken.
 * @param options - `ids`: only these rows, due or not (fresh mail after its commit); `limit`: at most this many
 */
export async function claimDueMail(options: { ids?: number[]; limit?: number } = {}): Promise<Claim> {
  const token = randomBytes(16).toString('hex');
  const now = new Date();
  // How long this sender holds the rows (MAIL_CLAIM_SECONDS): a crashed sender releases them this way.
  const until = new Date(now.getTime() + getConfig().mailClaimMs);
  if (options.ids && !options.ids.length) return { token, until, rows: [] };
  const sequelize = Notification.sequelize!;
  // Named rows (fresh mail right after its commit) are taken whenever they are pending; otherwise only due ones.
  const filter = options.ids ? 'id IN (:ids)' : 'next_attempt_at <= :now';
  const claimed = affectedRows(
    await sequelize.query(
      'UPDATE mail_queue SET claim_token = :token, locked_until = :until, updated_at = :now ' +
        `WHERE status = 'pending' AND ${filter} AND (locked_until IS NULL OR locked_until < :now) ORDER BY id LIMIT :limit`,
      {
        replacements: { token, until, now, ids: options.ids ?? [], limit: options.limit ?? options.ids?.length ?? BATCH_SIZE },
        type: QueryTypes.UPDATE,
      },
    ),
  );
  if (claimed === 0) return { token, until, rows: [] };
  const rows = await Notification.findAll({ where: { claimToken: token }, order: [['id', 'ASC']] });
  return { token, until, rows };
}

/** Gives rows of a claim back unsent (the lease is too short to start another mail). */
async function releaseClaim(token: string, ids: number[]): Promise<void> {
  if (!ids.length) return;
  await Notification.update({ lockedUntil: null, claimToken: null }, { where: { id: { [Op.in]: ids }, claimToken: token } });
}

/** Stable Message-ID of a queued mail: every attempt carries the same one, so a receiver can tell repeats apart. */
export function queuedMessageId(id: number): string {
  let host = 'gantrywright.invalid';
  try {
    host = new URL(getConfig().appUrl).hostname || host;
  } catch {
    // keep the fallback
  }
  return `<mail-queue-${id}@${host}>`;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Records the outcome of a send. The UPDATE only matches while the row carries this sender's claim token, so applying
 * it twice changes nothing; unlike other writes it is therefore repeated when the database went away in the middle of
 * it (on a cluster: the sender's node died) — otherwise a mail already handed to SMTP would stay claimed and go out a
 * second time once the lease ran out. @returns the affected rows
 */
async function recordOutcome(update: () => Promise<[affectedCount: number]>): Promise<number> {
  for (let attempt = 1; ; attempt += 1) {
    try {
      const [affected] = await update();
      return affected;
    } catch (err) {
      const code = (err as { code?: string }).code;
      if (attempt >= 8 || (code !== 'db_outcome_unknown' && code !== 'db_unavailable')) throw err;
      await sleep(Math.min(4000, 250 * 2 ** (attempt - 1)));
    }
  }
}

/**
 * The content of a row: as stored, or — for kinds whose content holds a one-time secret — built now.
 * @returns null when a built mail has nobody to go to
 */
async function contentOf(row: Notification): Promise<MailContent | null> {
  if (row.kind === RESET_MAIL_KIND) return buildResetMail(row.toAddress);
  return { subject: row.subject, text: row.textBody, html: row.htmlBody };
}

/**
 * Sends one claimed row and records the outcome — sent, discarded (a mail built now that has nobody to go to), or
 * the error and when to try again — only while the claim is still this sender's.
 */
async function sendOne(row: Notification, token: string): Promise<'sent' | 'failed' | 'discarded'> {
  let error: string | null = null;
  const mine = { id: row.id, claimToken: token };
  try {
    const content = await contentOf(row);
    if (!content) {
      await recordOutcome(() =>
        Notification.update({ status: 'discarded', lockedUntil: null, claimToken: null, lastError: null }, { where: mine }),
      );
      return 'discarded';
    }
    const ok = await sendMail({
      to: row.toAddress,
      subject: content.subject,
      text: content.text,
      html: content.html,
      messageId: queuedMessageId(row.id),
    });
    if (!ok) error = 'The SMTP server did not accept the message (details in the server log).';
  } catch (err) {
    error = err instanceof Error ? err.message : String(err);
  }
  const attempts = row.attempts + 1;
  if (!error) {
    const sentAt = new Date();
    const affected = await recordOutcome(() =>
      Notification.update({ status: 'sent', attempts, sentAt, lockedUntil: null, lastError: null }, { where: mine }),
    );
    if (affected !== 1) logger.error({ mailId: row.id }, 'mail sent after its claim was lost');
    return 'sent';
  }
  const isLast = attempts >= MAX_ATTEMPTS;
  const delay = RETRY_BACKOFF_MS[Math.min(attempts - 1, RETRY_BACKOFF_MS.length - 1)];
  await recordOutcome(() =>
    Notification.update(
      {
        status: isLast ? 'failed' : 'pending',
        attempts,
        lastError: error.slice(0, 2000),
        lockedUntil: null,
        claimToken: null,
        nextAttemptAt: new Date(Date.now() + delay),
      },
      { where: mine },
    ),
  );
  logger[isLast ? 'error' : 'warn'](
    { mailId: row.id, kind: row.kind, to: row.toAddress, attempts, error },
    isLast ? 'mail given up' : 'mail will be retried',
  );
  return 'failed';
}

/**
 * Claims and sends queued mail that is due: the given ids, or up to one batch of any due rows.
 * @returns how many were sent, failed this time, or were discarded (nobody to send them to)
 */
export async function deliverQueuedMail(
  options: { ids?: number[]; limit?: number } = {},
): Promise<{ sent: number; failed: number; discarded: number }> {
  const outcome = { sent: 0, failed: 0, discarded: 0 };
  const claim = await claimDueMail(options);
  for (const [index, row] of claim.rows.entries()) {
    if (Date.now() + LONGEST_SEND_MS > claim.until.getTime()) {
      await releaseClaim(
        claim.token,
        claim.rows.slice(index).map((r) => r.id),
      );
      break;
    }
    outcome[await sendOne(row, claim.token)] += 1;
  }
  return outcome;
}

/**
 * Sends freshly queued mail in the background, after the transaction that queued it has committed.
 * Never throws and never delays the answer; whatever fails stays queued for the worker.
 */
export function deliverSoon(ids: number[]): void {
  if (!ids.length) return;
  void deliverQueuedMail({ ids }).catch((err: unknown) => logger.warn({ err }, 'queued mail left for the retry worker'));
}

/**
 * Starts the periodic retry of queued mail in this process (server/index.ts). Every process may run one: rows are
 * claimed in the database. @returns a function that stops it.
 */
export function startMailQueueWorker(intervalMs = getConfig().mailWorkerIntervalMs): () => void {
  let isRunning = false;
  const tick = async () => {
    if (isRunning) return;
    isRunning = true;
    try {
      // Drain what is due, a batch at a time.
      for (let pass = 0; pass < 20; pass += 1) {
        const { sent, failed, discarded } = await deliverQueuedMail();
        if (sent + failed + discarded < BATCH_SIZE) break;
      }
    } catch (err) {
      logger.warn({ err }, 'mail queue pass failed');
    } finally {
      isRunning = false;
    }
  };
  const timer = setInterval(() => void tick(), intervalMs);
  timer.unref();
  void tick();
  return () => clearInterval(timer);
}

// ---------------------------------------------------------------------------------------------------------
// The notices. Each has a plain-text and an HTML part and links back into the app.

function appLink(path: string): string {
  return `${getConfig().appUrl}${path}`;
}

function mail(input: {
  subject: string;
  title: string;
  greeting: string;
  paragraphs: string[];
  quote?: { label: string; text: string };
  /** Further quoted texts after `quote` (e.g. the justification of an approval with a failed check). */
  quotes?: { label: string; text: string }[];
  link: { path: string; label: string };
}): MailContent {
  const href = appLink(input.link.path);
  const textParts = [input.greeting, ...input.paragraphs];
  const quotes = [...(input.quote ? [input.quote] : []), ...(input.quotes ?? [])];
  for (const quote of quotes)
    textParts.push(
      `${quote.label}:\n${quote.text
        .split('\n')
        .map((l) => `  > ${l}`)
        .join('\n')}`,
    );
  textParts.push(`${input.link.label}: ${href}`);
  const quoteHtml = quotes
    .map(
      (quote) =>
        `<p style="margin:0 0 6px;font-weight:600">${escapeHtml(quote.label)}</p>` +
        `<blockquote style="margin:0 0 14px;padding:8px 12px;border-left:3px solid #b7791f;background:#f6ead6;white-space:pre-wrap">${escapeHtml(quote.text)}</blockquote>`,
    )
    .join('');
  const html =
    '<!doctype html><html><body style="font-family:Inter,Arial,sans-serif;color:#1d2624;line-height:1.5">' +
    `<h2 style="margin:0 0 16px;color:#146c66">${escapeHtml(input.title)}</h2>` +
    [input.greeting, ...input.paragraphs].map((p) => `<p style="margin:0 0 14px">${escapeHtml(p)}</p>`).join('') +
    quoteHtml +
    `<p style="margin:20px 0"><a href="${escapeHtml(href)}" style="background:#146c66;color:#fff;padding:10px 18px;border-radius:6px;text-decoration:none">${escapeHtml(input.link.label)}</a></p>` +
    `<p style="font-size:12px;color:#5d6b68">If the button does not work, open this address: ${escapeHtml(href)}</p>` +
    '<p style="font-size:12px;color:#5d6b68">Gantrywright</p></body></html>';
  return { subject: input.subject, text: `${textParts.join('\n\n')}\n\nGantrywright\n`, html };
}

/** What every review notice names. */
export type RevisionRef = { revisionId: number; number: number; designId: number; designName: string };

/** "1 failed check and 2 warnings", "no failed check and no warning". */
function checkCounts(checks: { fail: number; warn: number }): string {
  const fail = checks.fail ? plural(checks.fail, 'failed check') : 'no failed check';
  const warn = checks.warn ? plural(checks.warn, 'warning') : 'no warning';
  return `${fail} and ${warn}`;
}

/** To each reviewer: a revision waits for review, with its check counts. */
export function submittedMail(
  to: Recipient,
  rev: RevisionRef & { authorName: string; checks?: { ok: number; warn: number; fail: number } },
): MailContent {
  return mail({
    subject: `Review requested: ${rev.designName}, revision ${rev.number}${rev.checks?.fail ? ` (${plural(rev.checks.fail, 'failed check')})` : ''}`,
    title: 'A revision waits for review',
    greeting: `Hello ${to.name},`,
    paragraphs: [
      `${rev.authorName} submitted revision ${rev.number} of "${rev.designName}" for review. Its inputs and results are frozen.`,
      ...(rev.checks
        ? [
            `The engine reports ${checkCounts(rev.checks)}.` +
              (rev.checks.fail ? ' Approving it needs a written justification, which is printed on the design sheet.' : ''),
          ]
        : []),
    ],
    link: { path: `/review/${rev.revisionId}`, label: 'Open the review' },
  });
}

/** To the designer: the revision was returned, with the reviewer's reason. */
export function returnedMail(to: Recipient, rev: RevisionRef & { reviewerName: string; reason: string }): MailContent {
  return mail({
    subject: `Returned: ${rev.designName}, revision ${rev.number}`,
    title: 'Your revision was returned',
    greeting: `Hello ${to.name},`,
    paragraphs: [
      `${rev.reviewerName} returned revision ${rev.number} of "${rev.designName}". The design is editable again; change it and submit it once more.`,
    ],
    quote: { label: 'Reason', text: rev.reason },
    link: { path: `/designs/${rev.designId}`, label: 'Open the design' },
  });
}

/** To the designer: the revision was approved and its sheet published (with the justification of failed checks). */
export function approvedMail(
  to: Recipient,
  rev: RevisionRef & { reviewerName: string; comment: string; sheetId: number; justification?: string | null },
): MailContent {
  return mail({
    subject: `Approved: ${rev.designName}, revision ${rev.number}`,
    title: 'Your revision was approved',
    greeting: `Hello ${to.name},`,
    paragraphs: [
      `${rev.reviewerName} approved revision ${rev.number} of "${rev.designName}". Its design sheet is published for the makers.`,
    ],
    quote: rev.comment ? { label: 'Comment', text: rev.comment } : undefined,
    quotes: rev.justification ? [{ label: 'Approved although a check failed, because', text: rev.justification }] : [],
    link: { path: `/sheets/${rev.sheetId}`, label: 'Open the design sheet' },
  });
}

/** To each maker: a new design sheet is ready to build from. */
export function sheetPublishedMail(to: Recipient, rev: RevisionRef & { sheetId: number; sha256: string }): MailContent {
  return mail({
    subject: `New design sheet: ${rev.designName}, revision ${rev.number}`,
    title: 'A design sheet is ready',
    greeting: `Hello ${to.name},`,
    paragraphs: [
      `Revision ${rev.number} of "${rev.designName}" was approved; its design sheet is ready to download and build from.`,
      `SHA-256 of the A4 PDF: ${rev.sha256}`,
    ],
    link: { path: `/sheets/${rev.sheetId}`, label: 'Open the design sheet' },
  });
}
