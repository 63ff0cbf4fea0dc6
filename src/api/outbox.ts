import { get } from './http';
import type { Page, PageQuery } from './types';

/** One e-mail received by the local mail catcher. */
export interface OutboxMail {
  id: string | number;
  from: string;
  to: string[];
  subject: string;
  /** ISO 8601 timestamp */
  date: string;
  text: string;
  html: string | null;
}

/** Lists the e-mails the local mail catcher received, newest first (admin; development and test only). */
export const listOutbox = (query: PageQuery = {}): Promise<Page<OutboxMail>> => get('/outbox', { ...query });
