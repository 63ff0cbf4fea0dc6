import type { OutboxMail, Page } from '@/contracts';
import { getConfig } from '../config';
import { AppError } from '../errors';

/**
 * Lists the mail the local catcher received, newest first. Reads the catcher's loopback HTTP endpoint,
 * so every API process sees the same outbox.
 * @throws AppError 503 when the catcher is not running.
 */
export async function listOutbox(query: { page: number; pageSize: number; to?: string }): Promise<Page<OutboxMail>> {
  const { smtp, mailcatcherHttpPort } = getConfig();
  const url = `http://${smtp.host}:${mailcatcherHttpPort}/messages`;
  let messages: OutboxMail[];
  try {
    const res = await fetch(url, { signal: AbortSignal.timeout(3000) });
    if (!res.ok) throw new Error(`HTTP ${res.status}`);
    messages = (await res.json()) as OutboxMail[];
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
