import type { Health } from '@/contracts';
import { getConfig } from '../config';
import { getSequelize } from '../db';

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
