import { Op, type Transaction } from 'sequelize';
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
 * {@link startMailQueueWorker} with backoff. Rows are claimed with `locked_until`, so several server processes
 * can share the queue without sending a mail twice. A mail failure never undoes a transition.
 */

/** Someone to notify. */
export type Recipient = { email: string; name: string };

/** Wait before the 2nd, 3rd, … attempt; after the last one the mail is marked `failed`. */
export const RETRY_BACKOFF_MS = [30_000, 2 * 60_000, 10 * 60_000, 30 * 60_000, 60 * 60_000, 2 * 60 * 60_000, 6 * 60 * 60_000];
/** Attempts before giving up (each attempt is itself sendMail's three quick tries). */
export const MAX_ATTEMPTS = RETRY_BACKOFF_MS.length + 1;
/** How long one process holds a claimed row before another may try it (a crashed sender releases it this way). */
const CLAIM_MS = 2 * 60_000;
/** Rows handled per pass of the worker. */
const BATCH_SIZE = 25;

/**
 * Writes one mail per recipient into the queue, in `transaction`. Duplicate addresses are sent once.
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
  if (!unique.length) return [];
  const now = new Date();
  const rows = await Notification.bulkCreate(
    unique.map((r) => {
      const content = build(r);
      return {
        kind,
        toAddress: r.email,
        subject: content.subject.slice(0, 300),
        textBody: content.text,
        htmlBody: content.html,
        status: 'pending' as const,
        attempts: 0,
        lastError: null,
        nextAttemptAt: now,
        lockedUntil: null,
        sentAt: null,
      };
    }),
    { transaction },
  );
  return rows.map((r) => r.id);
}

/** Atomically takes a due row for this process. @returns whether this process may send it. */
async function claim(id: number, now: Date): Promise<boolean> {
  const [affected] = await Notification.update(
    { lockedUntil: new Date(now.getTime() + CLAIM_MS) },
    {
      where: {
        id,
        status: 'pending',
        nextAttemptAt: { [Op.lte]: now },
        [Op.or]: [{ lockedUntil: null }, { lockedUntil: { [Op.lt]: now } }],
      },
    },
  );
  return affected === 1;
}

/**
 * The content of a row: as stored, or — for kinds whose content holds a one-time secret — built now.
 * @returns null when a built mail has nobody to go to
 */
async function contentOf(row: Notification): Promise<MailContent | null> {
  if (row.kind === RESET_MAIL_KIND) return buildResetMail(row.toAddress);
  return { subject: row.subject, text: row.textBody, html: row.htmlBody };
}

/** Sends one claimed row and records the outcome: sent, discarded (nobody to send it to), or the error and when to try again. */
async function sendOne(row: Notification): Promise<'sent' | 'failed' | 'discarded'> {
  let error: string | null = null;
  try {
    const content = await contentOf(row);
    if (!content) {
      await Notification.update({ status: 'discarded', lockedUntil: null, lastError: null }, { where: { id: row.id } });
      return 'discarded';
    }
    const ok = await sendMail({ to: row.toAddress, subject: content.subject, text: content.text, html: content.html });
    if (!ok) error = 'The SMTP server did not accept the message (details in the server log).';
  } catch (err) {
    error = err instanceof Error ? err.message : String(err);
  }
  const attempts = row.attempts + 1;
  if (!error) {
    await Notification.update(
      { status: 'sent', attempts, sentAt: new Date(), lockedUntil: null, lastError: null },
      { where: { id: row.id } },
    );
    return 'sent';
  }
  const isLast = attempts >= MAX_ATTEMPTS;
  const delay = RETRY_BACKOFF_MS[Math.min(attempts - 1, RETRY_BACKOFF_MS.length - 1)];
  await Notification.update(
    {
      status: isLast ? 'failed' : 'pending',
      attempts,
      lastError: error.slice(0, 2000),
      lockedUntil: null,
      nextAttemptAt: new Date(Date.now() + delay),
    },
    { where: { id: row.id } },
  );
  logger[isLast ? 'error' : 'warn'](
    { mailId: row.id, kind: row.kind, to: row.toAddress, attempts, error },
    isLast ? 'mail given up' : 'mail will be retried',
  );
  return 'failed';
}

/**
 * Sends queued mail that is due: the given ids, or up to one batch of any due rows.
 * @returns how many were sent and how many failed this time
 */
export async function deliverQueuedMail(options: { ids?: number[] } = {}): Promise<{ sent: number; failed: number; discarded: number }> {
  const now = new Date();
  const where = options.ids
    ? { id: { [Op.in]: options.ids }, status: 'pending' }
    : { status: 'pending', nextAttemptAt: { [Op.lte]: now }, [Op.or]: [{ lockedUntil: null }, { lockedUntil: { [Op.lt]: now } }] };
  if (options.ids && !options.ids.length) return { sent: 0, failed: 0, discarded: 0 };
  const due = await Notification.findAll({ where, order: [['id', 'ASC']], limit: options.ids ? undefined : BATCH_SIZE });
  const outcome = { sent: 0, failed: 0, discarded: 0 };
  for (const row of due) {
    if (!(await claim(row.id, now))) continue;
    outcome[await sendOne(row)] += 1;
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
export function startMailQueueWorker(intervalMs = 30_000): () => void {
  let isRunning = false;
  const tick = async () => {
    if (isRunning) return;
    isRunning = true;
    try {
      await deliverQueuedMail();
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
  link: { path: string; label: string };
}): MailContent {
  const href = appLink(input.link.path);
  const textParts = [input.greeting, ...input.paragraphs];
  if (input.quote)
    textParts.push(
      `${input.quote.label}:\n${input.quote.text
        .split('\n')
        .map((l) => `  > ${l}`)
        .join('\n')}`,
    );
  textParts.push(`${input.link.label}: ${href}`);
  const quoteHtml = input.quote
    ? `<p style="margin:0 0 6px;font-weight:600">${escapeHtml(input.quote.label)}</p>` +
      `<blockquote style="margin:0 0 14px;padding:8px 12px;border-left:3px solid #b7791f;background:#f6ead6;white-space:pre-wrap">${escapeHtml(input.quote.text)}</blockquote>`
    : '';
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

/** To each reviewer: a revision waits for review. */
export function submittedMail(to: Recipient, rev: RevisionRef & { authorName: string }): MailContent {
  return mail({
    subject: `Review requested: ${rev.designName}, revision ${rev.number}`,
    title: 'A revision waits for review',
    greeting: `Hello ${to.name},`,
    paragraphs: [
      `${rev.authorName} submitted revision ${rev.number} of "${rev.designName}" for review. Its inputs and results are frozen.`,
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

/** To the designer: the revision was approved and its sheet published. */
export function approvedMail(to: Recipient, rev: RevisionRef & { reviewerName: string; comment: string; sheetId: number }): MailContent {
  return mail({
    subject: `Approved: ${rev.designName}, revision ${rev.number}`,
    title: 'Your revision was approved',
    greeting: `Hello ${to.name},`,
    paragraphs: [
      `${rev.reviewerName} approved revision ${rev.number} of "${rev.designName}". Its design sheet is published for the makers.`,
    ],
    quote: rev.comment ? { label: 'Comment', text: rev.comment } : undefined,
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
