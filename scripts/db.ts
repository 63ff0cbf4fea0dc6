/**
 * The project's private MariaDB: install (Debian package), initialise a data folder, start on
 * 127.0.0.1:<port>, create databases and the app user, stop cleanly, and recover after a crash.
 *
 *   tsx scripts/db.ts start    start (and leave running) the instance of DATA_DIR/mariadb on DB_PORT
 *   tsx scripts/db.ts stop     stop it
 *   tsx scripts/db.ts status   say whether it runs
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

type Log = (line: string) => void;
const defaultLog: Log = (line) => process.stdout.write(`${line}\n`);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const isRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

/** Raised when a Debian package is missing and we may not install it (not root). The message has the exact command. */
export class MissingPackagesError extends Error {
  constructor(
    readonly packages: string[],
    readonly command: string,
  ) {
    super(`Missing Debian package(s): ${packages.join(', ')}.\nInstall them as root, then run the command again:\n\n  ${command}\n`);
    this.name = 'MissingPackagesError';
  }
}

const SEARCH_DIRS = ['/usr/local/sbin', '/usr/local/bin', '/usr/sbin', '/usr/bin', '/sbin', '/bin'];

/** Finds an executable by name in PATH and the sbin folders (Debian keeps mariadbd in /usr/sbin). */
export function findBinary(name: string): string | null {
  const candidates = path.isAbsolute(name)
    ? [name]
    : [...(process.env.PATH ?? '').split(path.delimiter).filter(Boolean), ...SEARCH_DIRS].map((dir) => path.join(dir, name));
  for (const candidate of candidates) {
    try {
      fs.accessSync(candidate, fs.constants.X_OK);
      if (fs.statSync(candidate).isFile()) return candidate;
    } catch {
      // not here
    }
  }
  return null;
}

/** A Debian package and an executable (or, for a package without one, a file) that proves it is installed. */
export type DebianRequirement = { pkg: string; binary: string; file?: string };

const isPresent = (r: DebianRequirement) => (r.file ? fs.existsSync(r.file) : !!findBinary(r.binary));

export const MARIADB_PACKAGE: DebianRequirement = { pkg: 'mariadb-server', binary: 'mariadbd' };
export const CHROMIUM_PACKAGE: DebianRequirement = { pkg: 'chromium', binary: 'chromium' };
export const POPPLER_PACKAGE: DebianRequirement = { pkg: 'poppler-utils', binary: 'pdftoppm' };

/**
 * Makes sure each requirement's executable exists. Missing ones are installed with apt-get when running
 * as root; otherwise throws MissingPackagesError carrying the exact command to run.
 */
export function ensureDebianPackages(requirements: DebianRequirement[], log: Log = defaultLog): void {
  const missing = requirements.filter((r) => !isPresent(r));
  if (missing.length === 0) return;
  const packages = [...new Set(missing.map((r) => r.pkg))];
  const command = `sudo sh -c 'apt-get update && DEBIAN_FRONTEND=noninteractive apt-get install -y ${packages.join(' ')}'`;
  if (!isRoot()) throw new MissingPackagesError(packages, command);
  if (!findBinary('apt-get'))
    throw new Error(`Missing ${packages.join(', ')} and apt-get is not available: install them with your system's package manager.`);
  log(`Installing Debian package(s) ${packages.join(', ')} (apt-get)...`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const run = (args: string[]) => {
    const result = spawnSync('apt-get', args, { env, stdio: ['ignore', 'inherit', 'inherit'] });
    if (result.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed (exit ${result.status ?? result.signal}).`);
  };
  run(['-q', '-o', 'DPkg::Lock::Timeout=300', 'update']);
  run(['-q', '-o', 'DPkg::Lock::Timeout=300', 'install', '-y', ...packages]);
  const still = missing.filter((r) => !isPresent(r));
  if (still.length) throw new Error(`apt-get finished but ${still.map((r) => r.binary).join(', ')} is still missing.`);
}

function requireBinary(name: string): string {
  const found = findBinary(name);
  if (!found)
    throw new MissingPackagesError(
      [MARIADB_PACKAGE.pkg],
      `sudo sh -c 'apt-get update && DEBIAN_FRONTEND=noninteractive apt-get install -y ${MARIADB_PACKAGE.pkg}'`,
    );
  return found;
}

/** Where an instance keeps its files. */
export type MariaDbPaths = { dir: string; dataDir: string; socket: string; pidFile: string; errorLog: string; marker: string };

/** File locations for an instance folder (e.g. .data/mariadb). Long paths put the socket in the temp folder. */
export function mariaDbPaths(dir: string): MariaDbPaths {
  const abs = path.resolve(dir);
  let socket = path.join(abs, 'mariadbd.sock');
  // A Unix socket path must stay under ~108 bytes.
  if (Buffer.byteLength(socket) > 100) {
    socket = path.join(os.tmpdir(), `gw-mariadb-${createHash('sha256').update(abs).digest('hex').slice(0, 12)}.sock`);
  }
  return {
    dir: abs,
    dataDir: path.join(abs, 'data'),
    socket,
    pidFile: path.join(abs, 'mariadbd.pid'),
    errorLog: path.join(abs, 'error.log'),
    marker: path.join(abs, 'data', '.gantrywright-initialised'),
  };
}

/** The account used over the socket: root when running as root, else the OS user (unix_socket auth). */
function adminUser(): string {
  return isRoot() ? 'root' : os.userInfo().username;
}

function readPid(pidFile: string): number | null {
  try {
    const pid = Number(fs.readFileSync(pidFile, 'utf8').trim());
    return Number.isInteger(pid) && pid > 0 ? pid : null;
  } catch {
    return null;
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * The pid of a mariadbd serving `dataDir`, found from the process table (for when its pid file is gone or names
 * another process), or null.
 */
export function findMariaDbServing(dataDir: string): number | null {
  let entries: string[];
  try {
    entries = fs.readdirSync('/proc');
  } catch {
    return null;
  }
  for (const entry of entries) {
    const pid = Number(entry);
    if (Number.isInteger(pid) && pid > 0 && pid !== process.pid && isOurMariaDb(pid, dataDir)) return pid;
  }
  return null;
}

/** True when `pid` is a mariadbd serving `dataDir` (not some unrelated process that reused the pid). */
function isOurMariaDb(pid: number, dataDir: string): boolean {
  try {
    const args = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
    return args.some((a) => /mariadbd|mysqld/.test(path.basename(a))) && args.includes(`--datadir=${dataDir}`);
  } catch {
    return false;
  }
}

function clientArgs(paths: MariaDbPaths): string[] {
  return ['--no-defaults', `--socket=${paths.socket}`, `-u${adminUser()}`];
}

/** Runs SQL over the socket as the admin account (SQL goes through stdin, so passwords stay out of `ps`). */
export function runSql(paths: MariaDbPaths, sql: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(requireBinary('mariadb'), [...clientArgs(paths), '--batch', '--skip-column-names'], {
      stdio: ['pipe', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString();
    });
    child.stderr.on('data', (d: Buffer) => {
      err += d.toString();
    });
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve(out) : reject(new Error(`mariadb client failed (exit ${code}): ${err.trim()}`))));
    // A client that cannot connect exits before reading its input: that is reported by 'close', not as EPIPE.
    child.stdin.on('error', () => undefined);
    child.stdin.end(sql);
  });
}

function ping(paths: MariaDbPaths): boolean {
  const result = spawnSync(requireBinary('mariadb-admin'), [...clientArgs(paths), '--connect-timeout=2', 'ping'], {
    stdio: 'ignore',
    timeout: 5000,
  });
  return result.status === 0;
}

function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    socket.setTimeout(1000);
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('timeout', () => {
      socket.destroy();
      resolve(false);
    });
    socket.once('error', () => resolve(false));
  });
}

function tail(file: string, lines = 15): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no error log)';
  }
}

async function waitUntil(check: () => boolean | Promise<boolean>, timeoutMs: number, intervalMs = 100): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (await check()) return true;
    if (Date.now() > deadline) return false;
    await sleep(intervalMs);
  }
}

/** Stops the mariadbd with `pid`: clean shutdown over the socket, then SIGTERM, then SIGKILL. */
async function stopPid(paths: MariaDbPaths, pid: number, log: Log): Promise<void> {
  if (!isAlive(pid)) return;
  const shutdown = spawnSync(requireBinary('mariadb-admin'), [...clientArgs(paths), 'shutdown'], { stdio: 'ignore', timeout: 60_000 });
  // When the socket is unusable the shutdown command fails at once: go straight to SIGTERM (also a clean shutdown).
  if (shutdown.status === 0 && (await waitUntil(() => !isAlive(pid), 60_000))) return;
  if (shutdown.status === 0) log(`MariaDB (pid ${pid}) did not stop after shutdown; sending SIGTERM.`);
  process.kill(pid, 'SIGTERM');
  if (await waitUntil(() => !isAlive(pid), 30_000)) return;
  log(`MariaDB (pid ${pid}) still running; sending SIGKILL.`);
  process.kill(pid, 'SIGKILL');
  await waitUntil(() => !isAlive(pid), 10_000);
}

function removeStaleFiles(paths: MariaDbPaths): void {
  for (const file of [paths.pidFile, paths.socket, `${paths.socket}.lock`]) fs.rmSync(file, { force: true });
}

/**
 * Stops whatever instance runs on this folder (a left-over of a crashed run, or one started by the CLI).
 * @returns true when one was running.
 */
export async function stopMariaDbInDir(dir: string, log: Log = defaultLog): Promise<boolean> {
  const paths = mariaDbPaths(dir);
  const pid = readPid(paths.pidFile);
  if (pid && isAlive(pid) && isOurMariaDb(pid, paths.dataDir)) {
    await stopPid(paths, pid, log);
    removeStaleFiles(paths);
    return true;
  }
  if (fs.existsSync(paths.dir)) removeStaleFiles(paths);
  return false;
}

/** A running instance. `stop()` shuts it down cleanly (idempotent). */
export type MariaDbHandle = {
  paths: MariaDbPaths;
  port: number;
  /** The pid it had when started or adopted (MariaDB may have been restarted since: `stop()` finds the current one). */
  pid: number;
  /** True when an instance left running by an earlier run was reused. */
  adopted: boolean;
  /**
   * Stops the instance that serves this data folder now — the one started here, or one that replaced it after a
   * restart (issue 12, item 10: Ctrl-C said "Stopped MariaDB" while the restarted server kept running and held the
   * port). @returns the pid stopped, or null when none was running
   */
  stop: () => Promise<number | null>;
};

/**
 * Starts the instance of folder `dir` on 127.0.0.1:`port`, initialising the data folder on first use.
 * Reuses an instance already serving this folder on the same port (e.g. after `npm start` was killed),
 * restarts one on another port, and clears stale pid/socket files after a crash.
 * mariadbd runs in its own process group so Ctrl-C in the terminal reaches only us; we stop it in order.
 */
export async function startMariaDb(options: { dir: string; port: number; log?: Log }): Promise<MariaDbHandle> {
  const log = options.log ?? defaultLog;
  const paths = mariaDbPaths(options.dir);
  const mariadbd = requireBinary('mariadbd');
  fs.mkdirSync(paths.dir, { recursive: true });

  const makeHandle = (pid: number, adopted: boolean): MariaDbHandle => {
    let stopping: Promise<number | null> | undefined;
    const currentPid = (): number | null => {
      const fromFile = readPid(paths.pidFile);
      if (fromFile && isAlive(fromFile) && isOurMariaDb(fromFile, paths.dataDir)) return fromFile;
      if (isAlive(pid) && isOurMariaDb(pid, paths.dataDir)) return pid;
      return findMariaDbServing(paths.dataDir);
    };
    return {
      paths,
      port: options.port,
      pid,
      adopted,
      stop: () => {
        stopping ??= (async () => {
          const target = currentPid();
          if (target) await stopPid(paths, target, log);
          // Only once nothing serves the folder: the pid file and socket of a live server are never removed.
          if (!currentPid()) removeStaleFiles(paths);
          return target;
        })();
        return stopping;
      },
    };
  };

  // 1. An instance from an earlier run?
  const oldPid = readPid(paths.pidFile);
  if (oldPid && isAlive(oldPid) && isOurMariaDb(oldPid, paths.dataDir)) {
    const answering = await waitUntil(() => ping(paths), 30_000, 200);
    if (answering) {
      const port = Number((await runSql(paths, 'SELECT @@port;')).trim());
      if (port === options.port) {
        log(`MariaDB is already running on this data folder (pid ${oldPid}, port ${port}); reusing it.`);
        return makeHandle(oldPid, true);
      }
      log(`MariaDB from an earlier run listens on port ${port}, not ${options.port}; restarting it.`);
    } else {
      log(`MariaDB (pid ${oldPid}) from an earlier run does not answer; stopping it.`);
    }
    await stopPid(paths, oldPid, log);
  }
  removeStaleFiles(paths);

  // 2. First use (or an initialisation that was cut short): create the system tables.
  if (!fs.existsSync(paths.marker)) {
    fs.rmSync(paths.dataDir, { recursive: true, force: true });
    const shown = path.relative(process.cwd(), paths.dataDir);
    log(`Initialising a MariaDB data folder in ${shown && !shown.startsWith('..') ? shown : paths.dataDir} ...`);
    const result = spawnSync(
      requireBinary('mariadb-install-db'),
      ['--no-defaults', `--user=${adminUser()}`, `--datadir=${paths.dataDir}`, '--skip-test-db'],
      { encoding: 'utf8', timeout: 120_000 },
    );
    if (result.status !== 0) {
      throw new Error(`mariadb-install-db failed (exit ${result.status ?? result.signal}):\n${result.stderr || result.stdout}`);
    }
    fs.writeFileSync(paths.marker, `initialised ${new Date().toISOString()}\n`);
  }

  // 3. Someone else on the port would make mariadbd fail with a less helpful message.
  if (await portInUse(options.port)) {
    throw new Error(`Port ${options.port} on 127.0.0.1 is already in use by another program. Stop it, or choose another DB_PORT in .env.`);
  }

  // 4. Start.
  const args = [
    '--no-defaults',
    `--datadir=${paths.dataDir}`,
    `--socket=${paths.socket}`,
    `--pid-file=${paths.pidFile}`,
    `--port=${options.port}`,
    '--bind-address=127.0.0.1',
    '--skip-name-resolve',
    `--log-error=${paths.errorLog}`,
    '--character-set-server=utf8mb4',
    '--collation-server=utf8mb4_unicode_ci',
    '--default-time-zone=+00:00',
  ];
  if (isRoot()) args.splice(1, 0, '--user=root');
  const child: ChildProcess = spawn(mariadbd, args, { detached: true, stdio: 'ignore' });
  let exited: number | string | null = null;
  child.once('exit', (code, signal) => {
    exited = code ?? signal ?? 'unknown';
  });
  child.unref();

  const ready = await waitUntil(() => exited === null && ping(paths), 60_000, 100);
  if (!ready) {
    if (exited === null && child.pid) await stopPid(paths, child.pid, log);
    throw new Error(
      `MariaDB did not start on port ${options.port} (exit: ${exited ?? 'timeout'}). Last lines of ${paths.errorLog}:\n${tail(paths.errorLog)}`,
    );
  }
  const pid = readPid(paths.pidFile) ?? child.pid!;
  log(`MariaDB started on 127.0.0.1:${options.port} (pid ${pid}).`);
  return makeHandle(pid, false);
}

const quoteString = (value: string) => `'${value.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;
function assertIdentifier(name: string, what: string): void {
  if (!/^[A-Za-z0-9_]{1,64}$/.test(name)) throw new Error(`${what} "${name}" may contain only letters, digits and _.`);
}

/** A MariaDB account for TCP connections from 127.0.0.1. */
export type DbAccount = { user: string; password: string };

/** The only statements the application's account may run on its tables (issue 12, item 7). */
export const APP_PRIVILEGES = ['SELECT', 'INSERT', 'UPDATE', 'DELETE'] as const;

/**
 * Creates the databases (utf8mb4) and two accounts @'127.0.0.1':
 * - the schema owner (`owner`): every privilege on those databases; migrations and the demo seed run as it;
 * - the application (`user`): only SELECT, INSERT, UPDATE and DELETE on their tables, so a server bug or injected
 *   SQL cannot drop a table, remove the trigger that freezes published sheets, or grant itself more.
 * Without `owner` the application account gets every privilege itself (the layout before issue 12; migrations
 * then run as it). Idempotent: privileges are revoked and granted afresh each time (an older install's GRANT ALL
 * goes), and passwords are reset to the given ones so they always match .env. Name every database the accounts
 * use: grants on databases left out are revoked. `handle` may be any server reachable through its socket (a node of
 * the scale test's Galera cluster, where the statements replicate to every node).
 */
export async function ensureDatabases(
  handle: Pick<MariaDbHandle, 'paths'>,
  spec: { databases: string[]; user: string; password: string; owner?: DbAccount },
): Promise<void> {
  assertIdentifier(spec.user, 'DB_USER');
  if (spec.owner) {
    assertIdentifier(spec.owner.user, 'DB_OWNER_USER');
    if (spec.owner.user === spec.user) throw new Error('DB_OWNER_USER must differ from DB_USER: the server must not own the schema.');
  }
  spec.databases.forEach((db) => assertIdentifier(db, 'Database name'));
  const accountOf = (name: string) => `${quoteString(name)}@'127.0.0.1'`;
  const app = accountOf(spec.user);
  const ensureAccount = (account: string, password: string) => [
    `CREATE USER IF NOT EXISTS ${account} IDENTIFIED BY ${quoteString(password)};`,
    `ALTER USER ${account} IDENTIFIED BY ${quoteString(password)};`,
    `REVOKE ALL PRIVILEGES, GRANT OPTION FROM ${account};`,
  ];
  const appGrant = spec.owner ? APP_PRIVILEGES.join(', ') : 'ALL PRIVILEGES';
  const statements = [
    ...spec.databases.map((db) => `CREATE DATABASE IF NOT EXISTS \`${db}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`),
    ...(spec.owner ? ensureAccount(accountOf(spec.owner.user), spec.owner.password) : []),
    ...(spec.owner ? spec.databases.map((db) => `GRANT ALL PRIVILEGES ON \`${db}\`.* TO ${accountOf(spec.owner!.user)};`) : []),
    ...ensureAccount(app, spec.password),
    ...spec.databases.map((db) => `GRANT ${appGrant} ON \`${db}\`.* TO ${app};`),
    'FLUSH PRIVILEGES;',
  ];
  await runSql(handle.paths, statements.join('\n'));
}

/** Drops and re-creates a database (used by tests that need a blank one). */
export async function recreateDatabase(handle: MariaDbHandle, name: string): Promise<void> {
  assertIdentifier(name, 'Database name');
  await runSql(
    handle.paths,
    `DROP DATABASE IF EXISTS \`${name}\`; CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`,
  );
}

async function cli(): Promise<void> {
  const { loadDotEnv } = await import('../server/config');
  const { resolveFromRoot } = await import('../server/paths');
  loadDotEnv();
  const dir = path.join(resolveFromRoot(process.env.DATA_DIR || '.data'), 'mariadb');
  const port = Number(process.env.DB_PORT || 3407);
  const command = process.argv[2] ?? 'status';
  const paths = mariaDbPaths(dir);
  if (command === 'stop') {
    const stopped = await stopMariaDbInDir(dir);
    defaultLog(stopped ? `MariaDB on ${dir} stopped.` : `No MariaDB was running on ${dir}.`);
  } else if (command === 'status') {
    const pid = readPid(paths.pidFile);
    const running = pid !== null && isAlive(pid) && isOurMariaDb(pid, paths.dataDir);
    defaultLog(running ? `MariaDB on ${dir} is running (pid ${pid}).` : `MariaDB on ${dir} is not running.`);
    process.exitCode = running ? 0 : 3;
  } else if (command === 'start') {
    ensureDebianPackages([MARIADB_PACKAGE]);
    const handle = await startMariaDb({ dir, port });
    if (process.env.DB_PASSWORD) {
      await ensureDatabases(handle, {
        databases: [process.env.DB_NAME || 'gantrywright'],
        user: process.env.DB_USER || 'gantry',
        password: process.env.DB_PASSWORD,
        owner: process.env.DB_OWNER_PASSWORD
          ? { user: process.env.DB_OWNER_USER || 'gantry_owner', password: process.env.DB_OWNER_PASSWORD }
          : undefined,
      });
    }
    defaultLog('Left running; stop it with: npm run db:stop');
  } else {
    process.stderr.write('Usage: tsx scripts/db.ts start|stop|status\n');
    process.exitCode = 2;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  cli().catch((err: unknown) => {
    process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
    process.exit(1);
  });
}
