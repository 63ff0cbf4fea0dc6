import { get } from './http';

/** What `GET /api/health` reports. */
export interface Health {
  status: 'ok' | 'degraded';
  db: 'up' | 'down';
  version?: string;
  /** true when the Outbox (caught e-mails) is available, i.e. outside production */
  outbox?: boolean;
}

/** Reads the server's health and feature flags. A degraded server answers 503 (thrown as ApiError). */
export const fetchHealth = (): Promise<Health> => get('/health');
