import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { pathToFileURL } from 'node:url';
import v8 from 'node:v8';
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
 * How far V8 lets the old generation grow past what survived the last major garbage collection, in percent (by default
 * V8 picks it from its own speed estimates). Under a steady stream of /api/calc requests it picked so little (the limit
 * about 1.1–1.5× the live heap) that the event loop ran a major collection every 0.3–0.8 s, each pausing every
 * request for 5–30 ms, while freeing only a few MB (measured with --trace-gc). A fixed limit of 3× the live heap spaces
 * them seconds apart, for some tens of MB more heap per thread; in paired bench runs 200 % gave a lower /api/health
 * p99 under load than 100 % (12.6–14.4 vs 15.1–16.0 ms).
 */
const HEAP_GROWING_PERCENT = 200;

/**
 * Sets the V8 heap-growing factor for this process (all its threads). The flag is read at every major collection, so
 * setting it at start-up takes effect from the next one; `--heap-growing-percent=…` given to node (command line or NODE_OPTIONS) wins.
 */
function tuneGarbageCollection(): void {
  const given = [...process.execArgv, ...(process.env.NODE_OPTIONS ?? '').split(/\s+/)];
  if (given.some((arg) => /^--heap[-_]growing[-_]percent/.test(arg))) return;
  v8.setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
}

/**
 * Checks the database, then listens on HOST:PORT (or the given port; 0 picks a free one).
 * `close()` stops accepting connections, ends idle keep-alive sockets and closes the DB pool.
 */
export async function startServer(options: { port?: number; host?: string } = {}): Promise<RunningServer> {
  const config = getConfig();
  const log = getLogger();
  tuneGarbageCollection();
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
