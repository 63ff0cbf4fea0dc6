import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import type { TestProject } from 'vitest/node';
import { ROOT_DIR } from '../../server/paths';
import { buildClientIfStale } from '../../scripts/buildClient';
import { assertTestEnvironment, migrateDatabase, seedDatabase } from './db';

declare module 'vitest' {
  export interface ProvidedContext {
    /** Base URL of the app under test, e.g. http://127.0.0.1:41234 (no trailing slash). */
    baseUrl: string;
  }
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

async function waitForHealth(url: string, child: ChildProcess, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The e2e app server exited with code ${child.exitCode} before it was ready.`);
    try {
      const res = await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(1000) });
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`The e2e app server did not become healthy at ${url} within ${timeoutMs / 1000} s.`);
}

/**
 * Global setup of the `e2e` project: migrates and demo-seeds gw_test_e2e, builds the client when dist/
 * is missing or stale, and starts the app server on a free loopback port, exposed as `inject('baseUrl')`.
 *
 * The server runs as its own process (`node --import tsx server/index.ts`), exactly as in production:
 * this vitest process also serves the `api` project, whose workers use DB_NAME=gw_test_api, and the
 * server's configuration and models are process-wide singletons.
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  assertTestEnvironment();
  const databaseName = process.env.GW_TEST_DB_E2E ?? 'gw_test_e2e';
  await migrateDatabase(databaseName);
  await seedDatabase(databaseName);
  await buildClientIfStale();

  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: ROOT_DIR,
    env: { ...process.env, DB_NAME: databaseName, PORT: String(port), HOST: '127.0.0.1', APP_URL: url, LOGIN_RATE_LIMIT: '10' },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  try {
    await waitForHealth(url, child, 30_000);
  } catch (err) {
    child.kill('SIGKILL');
    throw err;
  }
  project.provide('baseUrl', url);

  return async function teardown() {
    if (child.exitCode !== null) return;
    await new Promise<void>((resolve) => {
      const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
      child.once('exit', () => {
        clearTimeout(timer);
        resolve();
      });
      child.kill('SIGTERM');
    });
  };
}
