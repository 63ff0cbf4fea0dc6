import { getConfig } from '../config';
import { getSequelize } from '../db';

/** The health answer: status, database reachability, version, and whether the Outbox exists. */
export type Health = { status: 'ok' | 'degraded'; db: 'up' | 'down'; version: string; outbox: boolean };

/** Pings the database (2 s limit). */
export async function checkHealth(): Promise<Health> {
  const config = getConfig();
  let dbUp: boolean;
  try {
    await Promise.race([
      getSequelize().query('SELECT 1'),
      new Promise((_, reject) => setTimeout(() => reject(new Error('db ping timeout')), 2000).unref()),
    ]);
    dbUp = true;
  } catch {
    dbUp = false;
  }
  return { status: dbUp ? 'ok' : 'degraded', db: dbUp ? 'up' : 'down', version: config.version, outbox: !config.isProduction };
}
