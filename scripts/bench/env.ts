import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { ROOT_DIR } from '../../server/paths';
import { ensureDatabases, ensureDebianPackages, MARIADB_PACKAGE, startMariaDb, type MariaDbHandle } from '../db';
import { startMailCatcher, type MailCatcher } from '../mailcatcher';
import { say, sleep } from './lib';

/**
 * What the server-side benchmarks run against: a private MariaDB (`.data-bench`, kept between runs so the
 * 10,000-design database is seeded once), a mail catcher, and app servers started as their own processes, as in
 * production. Ports: 3600 / 2600 / 5600 + the offset (GW_BENCH_PORT_OFFSET, else GW_TEST_PORT_OFFSET), so a
 * benchmark never meets `npm start` or `npm test` of this or another checkout.
 */

/** Offset of every bench port. */
export const BENCH_OFFSET = Number(process.env.GW_BENCH_PORT_OFFSET ?? process.env.GW_TEST_PORT_OFFSET ?? 0);
export const BENCH_PORTS = {
  db: 3600 + BENCH_OFFSET,
  smtp: 2600 + BENCH_OFFSET,
  mailHttp: 2601 + BENCH_OFFSET,
  /** App servers take 5600 + offset + 0, 1, 2 … */
  app: 5600 + BENCH_OFFSET,
};
const DATA_DIR = path.join(ROOT_DIR, '.data-bench');
const DB_USER = 'gw_bench';
/** The demo database every server benchmark uses, and the one with 10,000 designs (list benchmark). */
export const BENCH_DB = 'gw_bench';
export const BENCH_DB_MANY = 'gw_bench_many';
/** Every demo account's password (server/seeders/demoAccounts.ts). */
export const DEMO_PASSWORD = 'gantry-demo';

/** A bench environment; `close()` stops everything it started. */
export interface BenchEnv {
  db: MariaDbHandle;
  dbPassword: string;
  mail: MailCatcher;
  close(): Promise<void>;
}

let shared: Promise<BenchEnv> | null = null;

/** Starts (once per bench run) MariaDB with the demo database migrated and seeded, and the mail catcher. */
export function benchEnv(): Promise<BenchEnv> {
  shared ??= (async () => {
    ensureDebianPackages([MARIADB_PACKAGE], say);
    fs.mkdirSync(DATA_DIR, { recursive: true });
    const db = await startMariaDb({ dir: path.join(DATA_DIR, 'mariadb'), port: BENCH_PORTS.db, log: say });
    const dbPassword = randomBytes(18).toString('base64url');
    await ensureDatabases(db, { databases: [BENCH_DB, BENCH_DB_MANY], user: DB_USER, password: dbPassword });
    Object.assign(process.env, dbEnv(BENCH_DB, dbPassword));
    const { migrateAndSeed } = await import('./seed');
    await migrateAndSeed(BENCH_DB);
    const mail = await startMailCatcher({
      smtpPort: BENCH_PORTS.smtp,
      httpPort: BENCH_PORTS.mailHttp,
      dir: path.join(DATA_DIR, 'mail'),
      log: () => undefined,
    });
    return {
      db,
      dbPassword,
      mail,
      async close() {
        await mail.close();
        await db.stop();
      },
    };
  })();
  return shared;
}

/** Stops the shared environment if one was started. */
export async function closeBenchEnv(): Promise<void> {
  if (!shared) return;
  const env = await shared;
  shared = null;
  await env.close();
}

/** Environment variables that point the app at a bench database. */
export function dbEnv(database: string, password: string): Record<string, string> {
  return {
    DB_HOST: '127.0.0.1',
    DB_PORT: String(BENCH_PORTS.db),
    DB_NAME: database,
    DB_USER,
    DB_PASSWORD: password,
    JWT_SECRET: process.env.BENCH_JWT_SECRET ?? (process.env.BENCH_JWT_SECRET = randomBytes(32).toString('hex')),
    SMTP_PORT: String(BENCH_PORTS.smtp),
    MAILCATCHER_HTTP_PORT: String(BENCH_PORTS.mailHttp),
    LOG_LEVEL: 'warn',
  };
}

/** A running app server process. */
export interface AppProcess {
  url: string;
  label: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

/**
 * Starts `server/index.ts` of a checkout as its own process and waits until /api/health answers.
 * @param options - checkout folder, port, database and extra environment
 */
export async function startApp(options: {
  cwd: string;
  port: number;
  database: string;
  label: string;
  env?: Record<string, string>;
}): Promise<AppProcess> {
  const env = await benchEnv();
  const url = `http://127.0.0.1:${options.port}`;
  // BENCH_APP_NODE_ARGS (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof") profiles the servers under load.
  const extraArgs = (process.env.BENCH_APP_NODE_ARGS ?? '').split(' ').filter(Boolean);
  const child = spawn(process.execPath, [...extraArgs, '--import', 'tsx', 'server/index.ts'], {
    cwd: options.cwd,
    env: {
      ...process.env,
      ...dbEnv(options.database, env.dbPassword),
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(options.port),
      APP_URL: url,
      LOGIN_RATE_LIMIT: '100000',
      DATA_DIR: path.join(DATA_DIR, `app-${options.port}`),
      ...options.env,
    },
    // The server logs (pino, warnings and up) go to this process's stderr with the progress lines.
    stdio: ['ignore', process.stderr, 'inherit'],
  });
  child.once('exit', (code, signal) => {
    if (!stopping) say(`${options.label} server on ${url} exited unexpectedly (code ${code}, signal ${signal})`);
  });
  let stopping = false;
  const deadline = Date.now() + 120_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`${options.label} server exited with code ${child.exitCode}`);
    try {
      const res = await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(1000) });
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`${options.label} server did not answer on ${url}`);
    }
    await sleep(200);
  }
  return {
    url,
    label: options.label,
    child,
    stop: () =>
      new Promise<void>((resolve) => {
        stopping = true;
        if (child.exitCode !== null) return resolve();
        const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
        child.once('exit', () => {
          clearTimeout(timer);
          resolve();
        });
        child.kill('SIGTERM');
      }),
  };
}

/**
 * A checkout of `ref` in a temporary folder (git worktree), sharing this checkout's node_modules, for measuring
 * today's code against an earlier commit in the same run. `remove()` deletes it again.
 * @param overlay - folders (relative to the repository) copied from this checkout over the baseline's, e.g. the
 *   engine, so that the baseline's server computes the same answer as this checkout's and only the server differs
 */
export function baselineCheckout(ref: string, overlay: readonly string[] = []): { dir: string; commit: string; remove(): void } {
  const commit = spawnSync('git', ['rev-parse', '--verify', `${ref}^{commit}`], { cwd: ROOT_DIR, encoding: 'utf8' }).stdout.trim();
  if (!commit) throw new Error(`baseline ${ref} is not a commit of this repository`);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-bench-baseline-'));
  fs.rmSync(dir, { recursive: true });
  const add = spawnSync('git', ['worktree', 'add', '--detach', dir, commit], { cwd: ROOT_DIR, encoding: 'utf8' });
  if (add.status !== 0) throw new Error(`git worktree add failed: ${add.stderr}`);
  fs.symlinkSync(path.join(ROOT_DIR, 'node_modules'), path.join(dir, 'node_modules'), 'dir');
  for (const folder of overlay) {
    // Replaced whole, so a file the baseline had and this checkout deleted does not linger.
    fs.rmSync(path.join(dir, folder), { recursive: true, force: true });
    fs.cpSync(path.join(ROOT_DIR, folder), path.join(dir, folder), { recursive: true });
  }
  return {
    dir,
    commit,
    remove() {
      spawnSync('git', ['worktree', 'remove', '--force', dir], { cwd: ROOT_DIR });
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A keep-alive HTTP client with a session cookie, light enough to drive load from this process. */
export class Client {
  private readonly agent = new http.Agent({ keepAlive: true, maxSockets: 256 });
  cookie = '';
  constructor(readonly base: string) {}

  /**
   * One request; resolves with status, body, its size and the time it took [ms].
   * @param body - a value sent as JSON, or bytes already encoded (a load loop encodes its body once)
   * @param options.discardBody - count the answer's bytes without decoding them (`body` is then empty), so a load
   *   loop spends as little CPU as a client on another machine would take from this one
   */
  request(
    method: string,
    url: string,
    body?: unknown,
    options: { discardBody?: boolean } = {},
  ): Promise<{ status: number; body: string; bytes: number; ms: number; headers: http.IncomingHttpHeaders }> {
    const data = body === undefined ? undefined : Buffer.isBuffer(body) ? body : Buffer.from(JSON.stringify(body));
    const started = performance.now();
    return new Promise((resolve, reject) => {
      const req = http.request(
        `${this.base}${url}`,
        {
          method,
          agent: this.agent,
          headers: {
            ...(data ? { 'Content-Type': 'application/json', 'Content-Length': data.length } : {}),
            ...(this.cookie ? { Cookie: this.cookie } : {}),
          },
        },
        (res) => {
          const chunks: Buffer[] = [];
          let bytes = 0;
          res.on('data', (c: Buffer) => {
            bytes += c.length;
            if (!options.discardBody) chunks.push(c);
          });
          res.on('end', () =>
            resolve({
              status: res.statusCode ?? 0,
              body: options.discardBody ? '' : Buffer.concat(chunks).toString('utf8'),
              bytes,
              ms: performance.now() - started,
              headers: res.headers,
            }),
          );
          res.on('error', reject);
        },
      );
      req.on('error', reject);
      req.end(data);
    });
  }

  /** Signs in and keeps the session cookie. */
  async signIn(email: string, password = DEMO_PASSWORD): Promise<void> {
    const res = await new Promise<http.IncomingMessage>((resolve, reject) => {
      const data = Buffer.from(JSON.stringify({ email, password }));
      const req = http.request(
        `${this.base}/api/auth/login`,
        { method: 'POST', agent: this.agent, headers: { 'Content-Type': 'application/json', 'Content-Length': data.length } },
        resolve,
      );
      req.on('error', reject);
      req.end(data);
    });
    res.resume();
    const set = res.headers['set-cookie'] ?? [];
    if (res.statusCode !== 200 || !set.length) throw new Error(`sign-in as ${email} failed at ${this.base} (${res.statusCode})`);
    this.cookie = set.map((c) => c.split(';')[0]).join('; ');
  }

  close(): void {
    this.agent.destroy();
  }
}

// Ctrl-C during a benchmark still stops the bench MariaDB and mail catcher.
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    void closeBenchEnv().finally(() => process.exit(130));
  });
}
