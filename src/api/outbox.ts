import type { OutboxListQuery, OutboxMail, Page } from '@/contracts';
import { get } from './http';

export type { OutboxMail };

/** Lists the e-mails the local mail catcher received, newest first (admin; development and test only). */
export const listOutbox = (query: OutboxListQuery = {}): Promise<Page<OutboxMail>> => get('/outbox', { ...query });
