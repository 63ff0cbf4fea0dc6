// Answers about the running system: its health and, outside production, the mail it caught.

/** What GET /api/health answers (503 with the same body when the database does not answer). */
export type Health = {
  status: 'ok' | 'degraded';
  db: 'up' | 'down';
  version: string;
  /** True when the Outbox (caught e-mails) is available, i.e. outside production. */
  outbox: boolean;
};

/** One e-mail caught by the local mail catcher (GET /api/outbox; development and test only). */
export type OutboxMail = {
  id: string;
  from: string;
  to: string[];
  subject: string;
  /** ISO 8601 timestamp */
  date: string;
  text: string;
  html: string;
};
