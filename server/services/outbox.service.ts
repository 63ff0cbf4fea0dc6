import type { Page } from '@/contracts';
import { getConfig } from '../config';
import { AppError } from '../errors';

/** One e-mail caught by the local mail catcher (scripts/mailcatcher.ts). */
export type OutboxMessage = { id: string; from: string; to: string[]; subject: string; date: string; text: string; html: string };

/**
 * Lists the mail the local catcher received, newest first. Reads the catcher's loopback HTTP endpoint,
 * so every API process sees the same outbox.
 * @throws AppError 503 when the catcher is not running.
 */
export async function listOutbox(query: { page: number; pageSize: number; to?: string }): Promise<Page<OutboxMessage>> {
  const { smtp, mailcatcherHttpPort } = getConfig();
  const url = `http://${smtp.host}:${mailcatcherHttpPort}/messages`;
  let messages: OutboxMessage[];
  try {
    const res = await fetch(url, { signal: AbortSignal.timeout(3000) });
    if (!res.ok) throw new Error(`HTTP ${res.status}`);
    messages = (await res.json()) as OutboxMessage[];
  } catch (err) {
    throw new AppError('mailcatcher_unavailable', `The local mail catcher is not reachable at ${url}. Start the app with npm start.`, 503, {
      cause: err,
    });
  }
  const wanted = query.to?.toLowerCase();
  const filtered = (wanted ? messages.filter((m) => m.to.some((t) => t.toLowerCase() === wanted)) : messages)
    .slice()
    .sort((a, b) => (a.date < b.date ? 1 : a.date > b.date ? -1 : 0));
  const start = (query.page - 1) * query.pageSize;
  return { items: filtered.slice(start, start + query.pageSize), total: filtered.length, page: query.page, pageSize: query.pageSize };
}
