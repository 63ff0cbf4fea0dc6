import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { pathToFileURL } from 'node:url';
import { createApp } from './app';
import { ConfigError, getConfig, loadDotEnv } from './config';
import { closeSequelize, getSequelize } from './db';
import { getLogger } from './logger';
import { closeMail } from './services/mail.service';
import { startMailQueueWorker } from './services/notify.service';
import { getContentStore, startContentSweeper } from './storage';
import { closePasswordPool } from './workers/passwordPool';
import { closePools, warmPools } from './workers/pool';

/** A listening server and how to stop it. */
export type RunningServer = { server: Server; url: string; port: number; close: () => Promise<void> };

/**
 * Checks the database, then listens on HOST:PORT (or the given port; 0 picks a free one).
 * `close()` stops accepting connections, ends idle keep-alive sockets and closes the DB pool.
 */
export async function startServer(options: { port?: number; host?: string } = {}): Promise<RunningServer> {
  const config = getConfig();
  const log = getLogger();
  await getSequelize().authenticate();
  const app = createApp();
  // Start the engine thread now, so the first calculation does not wait for it to load.
  void warmPools().catch((err: unknown) => log.error({ err }, 'engine worker pool failed to start'));
  const host = options.host ?? config.host;
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(options.port ?? config.port, host, () => resolve(s));
    s.once('error', reject);
  });
  // Behind a load balancer that keeps connections to the app open, the app must not be the side that closes an idle
  // one first: a request the balancer sends just as the app closes the socket would fail (502). Balancers drop idle
  // connections within seconds to a minute; this outlasts that.
  server.keepAliveTimeout = 65_000;
  server.headersTimeout = 66_000;
  const port = (server.address() as AddressInfo).port;
  const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
  log.info({ url }, 'server listening');
  // Queued notices that could not be sent right after their transition are retried from here (every process may
  // run this: rows are claimed in the database).
  const stopMailWorker = startMailQueueWorker();
  // Stored bytes that a stopped process left orphaned are removed from here (claimed in the database as well).
  const stopContentSweeper = startContentSweeper(getContentStore);

  let closing: Promise<void> | undefined;
  const close = () => {
    closing ??= (async () => {
      stopMailWorker();
      stopContentSweeper();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeIdleConnections();
        // Requests still running get a short grace period, then their sockets are cut.
        setTimeout(() => server.closeAllConnections(), 5000).unref();
      });
      closeMail();
      await Promise.all([closePools(), closePasswordPool()]);
      await closeSequelize();
      log.info('server stopped');
    })();
    return closing;
  };
  return { server, url, port, close };
}

/** Runs as a process: `tsx server/index.ts`. Reads .env, fails fast on bad configuration. */
async function main(): Promise<void> {
  loadDotEnv();
  try {
    getConfig();
  } catch (err) {
    if (err instanceof ConfigError) {
      process.stderr.write(`${err.message}\n`);
      process.exit(1);
    }
    throw err;
  }
  const log = getLogger();
  let running: RunningServer;
  try {
    running = await startServer();
  } catch (err) {
    log.fatal({ err }, 'server failed to start');
    process.stderr.write(`Server failed to start: ${(err as Error).message}\n`);
    process.exit(1);
  }
  const shutdown = (signal: string) => {
    log.info({ signal }, 'shutting down');
    running.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.once('SIGTERM', () => shutdown('SIGTERM'));
  process.once('SIGINT', () => shutdown('SIGINT'));
  // Errors outside a request mean the process state is unknown: log and exit, let the supervisor restart.
  process.on('unhandledRejection', (reason) => {
    log.fatal({ err: reason }, 'unhandled promise rejection');
    process.exit(1);
  });
  process.on('uncaughtException', (err) => {
    log.fatal({ err }, 'uncaught exception');
    process.exit(1);
  });
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  void main();
}
