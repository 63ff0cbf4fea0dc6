/**
 * `npm start` (and `npm run dev` = `--dev`): everything the app needs, on this machine, in order:
 * .env (created on first run with random secrets) -> MariaDB (installed from Debian when missing, private
 * data folder under DATA_DIR/mariadb) -> database + app user -> migrations -> demo seeders -> client build
 * (when stale; skipped with --dev) -> mail catcher -> API server (-> Vite dev server with --dev).
 * Ctrl-C / SIGTERM stops them in reverse order; MariaDB gets a clean shutdown.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { parseEnv } from 'node:util';
import { pathToFileURL } from 'node:url';
import { ROOT_DIR } from '../server/paths';
import { ConfigError, getConfig, loadDotEnv, type AppConfig } from '../server/config';
import { isPlaceholderSecret } from '../server/security/secretStrength';
import { ensureDatabases, ensureDebianPackages, MARIADB_PACKAGE, MissingPackagesError, startMariaDb, type MariaDbHandle } from './db';
import { startMailCatcher, type MailCatcher } from './mailcatcher';
import { buildClientIfStale } from './buildClient';
import { acquireRunLock } from './runLock';

const say = (line = '') => process.stdout.write(`${line}\n`);
const ENV_FILE = path.join(ROOT_DIR, '.env');
const ENV_EXAMPLE = path.join(ROOT_DIR, '.env.example');
const isLocalHost = (host: string) => ['127.0.0.1', 'localhost', '::1'].includes(host);

/** Variables `npm start` fills with random values: the session signing secret and the two database passwords. */
export const GENERATED_SECRETS = ['JWT_SECRET', 'DB_PASSWORD', 'DB_OWNER_PASSWORD'] as const;
/** Of those, the ones that must match what a database server already has (left alone when DB_HOST is not local). */
const DATABASE_SECRETS = new Set<string>(['DB_PASSWORD', 'DB_OWNER_PASSWORD']);

/** 32 random bytes, base64url: 43 characters. */
const randomSecret = () => randomBytes(32).toString('base64url');

/**
 * Creates .env from .env.example on first run, with random secrets. On later runs, fills in any of
 * {@link GENERATED_SECRETS} that is missing, empty or still a published placeholder (the value .env.example ships,
 * or any "change-me…"): such a value is public, and a session signed with it could be forged. The database passwords
 * are only generated for the project's own local MariaDB, whose accounts npm start then sets to match.
 * @returns what was done, one line each (printed by npm start)
 */
export function ensureEnvFile(files: { env: string; example: string } = { env: ENV_FILE, example: ENV_EXAMPLE }): string[] {
  if (!fs.existsSync(files.env)) {
    let text = fs.readFileSync(files.example, 'utf8');
    for (const key of GENERATED_SECRETS) text = setEnvLine(text, key, randomSecret());
    fs.writeFileSync(files.env, text, { mode: 0o600 });
    return [`Created .env with a random ${GENERATED_SECRETS.join(', ')}.`];
  }
  let text = fs.readFileSync(files.env, 'utf8');
  const values = parseEnv(text) as Record<string, string>;
  // A cluster (DB_NODES) is someone else's servers, like a DB_HOST elsewhere: its passwords are not ours to invent.
  const dbIsLocal = isLocalHost(values.DB_HOST || '127.0.0.1') && !values.DB_NODES?.trim();
  const messages: string[] = [];
  for (const key of GENERATED_SECRETS) {
    const value = values[key]?.trim() ?? '';
    const isPlaceholder = value !== '' && isPlaceholderSecret(value);
    if (value !== '' && !isPlaceholder) continue;
    if (DATABASE_SECRETS.has(key) && !dbIsLocal) {
      if (isPlaceholder)
        messages.push(`${key} in .env is still a placeholder; set it to the password of ${values.DB_NODES?.trim() || values.DB_HOST}.`);
      continue;
    }
    text = setEnvLine(text, key, randomSecret());
    messages.push(
      isPlaceholder
        ? `Replaced the placeholder ${key} in .env with a random value (the placeholder is public${key === 'JWT_SECRET' ? '; everyone signs in again' : ''}).`
        : `Added a random ${key} to .env.`,
    );
  }
  if (messages.some((m) => m.startsWith('Replaced') || m.startsWith('Added'))) fs.writeFileSync(files.env, text, { mode: 0o600 });
  return messages;
}

/** Sets `KEY=value` in .env text: replaces the line when present, appends it otherwise. */
function setEnvLine(text: string, key: string, value: string): string {
  const line = new RegExp(`^${key}=.*$`, 'm');
  return line.test(text) ? text.replace(line, `${key}=${value}`) : `${text.replace(/\n?$/, '\n')}${key}=${value}\n`;
}

type Running = {
  db?: MariaDbHandle;
  catcher?: MailCatcher;
  server?: { close: () => Promise<void> };
  vite?: ChildProcess;
  closeDb?: () => Promise<void>;
};

/** Stops everything that was started, newest first. Each step is attempted even if an earlier one fails. */
async function stopAll(running: Running): Promise<void> {
  const stopMariaDb = async (): Promise<string> => {
    const pid = await running.db!.stop();
    return pid ? `Stopped MariaDB (pid ${pid}).` : 'MariaDB was no longer running.';
  };
  const steps: Array<[string, (() => Promise<string | void>) | undefined]> = [
    ['Vite dev server', running.vite ? () => stopChild(running.vite!) : undefined],
    ['API server', running.server?.close],
    ['database connections', running.closeDb],
    ['mail catcher', running.catcher?.close],
    // Whatever instance serves the data folder now, also one restarted since npm start began.
    ['MariaDB', running.db ? stopMariaDb : undefined],
  ];
  for (const [name, step] of steps) {
    if (!step) continue;
    try {
      const said = await step();
      say(said || `Stopped ${name}.`);
    } catch (err) {
      say(`Could not stop ${name} cleanly: ${(err as Error).message}`);
    }
  }
}

function stopChild(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    child.once('exit', () => resolve());
    child.kill('SIGTERM');
    setTimeout(() => child.kill('SIGKILL'), 5000).unref();
  });
}

function printBanner(config: AppConfig, dev: boolean, formatDemoSignIns: () => string): void {
  const line = '-'.repeat(64);
  say(line);
  say(
    `Gantrywright is running: ${dev ? `http://127.0.0.1:${process.env.VITE_PORT ?? 5173}  (Vite hot reload; API on ${config.appUrl})` : config.appUrl}`,
  );
  if (!config.isProduction) say(`Caught e-mail: Outbox screen, or http://${config.smtp.host}:${config.mailcatcherHttpPort}/messages`);
  say('');
  say(formatDemoSignIns());
  say('');
  say('Press Ctrl-C to stop the server, the mail catcher and MariaDB.');
  say(line);
}

async function main(): Promise<void> {
  const dev = process.argv.includes('--dev');
  for (const line of ensureEnvFile()) say(line);
  loadDotEnv(ENV_FILE);
  let config: AppConfig;
  try {
    config = getConfig();
  } catch (err) {
    if (err instanceof ConfigError) {
      process.stderr.write(`${err.message}\nFix .env (see .env.example) and run npm start again.\n`);
      process.exit(1);
    }
    throw err;
  }

  try {
    acquireRunLock(path.join(config.dataDir, 'start.lock'), 'npm start');
  } catch (err) {
    process.stderr.write(`${(err as Error).message}\n`);
    process.exit(1);
  }

  const running: Running = {};
  let stopping: Promise<void> | undefined;
  const shutdown = (reason: string, code: number) => {
    if (stopping) {
      say('Still stopping... (press Ctrl-C again to force)');
      return;
    }
    say(`\n${reason}: stopping...`);
    stopping = stopAll(running).then(() => process.exit(code));
  };
  // One Ctrl-C can arrive more than once (the terminal signals the whole process group and the tsx
  // wrapper relays it too), so repeats within 1.5 s do not count toward forcing an exit.
  let signals = 0;
  let lastSignalAt = 0;
  const onSignal = (signal: NodeJS.Signals) => {
    const now = Date.now();
    if (now - lastSignalAt < 1500) return;
    lastSignalAt = now;
    signals += 1;
    if (signals >= 3) {
      say('Forced exit. MariaDB may still run; the next npm start reuses it, or run npm run db:stop.');
      process.exit(130);
    }
    shutdown(signal, 0);
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
  process.on('unhandledRejection', (reason) => {
    process.stderr.write(`Unexpected error: ${reason instanceof Error ? reason.stack : String(reason)}\n`);
    shutdown('Unexpected error', 1);
  });

  try {
    // Server modules read configuration at import time of first use, so import them after .env is loaded.
    const { closeSequelize } = await import('../server/db');
    const { runMigrations, runSeeders, withSchemaOwner } = await import('../server/migrator');
    const { formatDemoSignIns } = await import('../server/seeders/demoAccounts');
    const { startServer } = await import('../server/index');

    // A list of cluster nodes (DB_NODES) is someone else's servers (e.g. tsx scripts/cluster.ts start), never the private one.
    if (isLocalHost(config.db.host) && (config.db.nodes?.length ?? 1) === 1) {
      ensureDebianPackages([MARIADB_PACKAGE], say);
      running.db = await startMariaDb({ dir: path.join(config.dataDir, 'mariadb'), port: config.db.port, log: say });
      await ensureDatabases(running.db, {
        databases: [config.db.name],
        user: config.db.user,
        password: config.db.password,
        owner: config.dbOwner ?? undefined,
      });
    } else {
      say(
        `Using the MariaDB server(s) at ${(config.db.nodes ?? [config.db]).map((n) => `${n.host}:${n.port}`).join(', ')} (not the private one).`,
      );
    }

    running.closeDb = closeSequelize;
    // Migrations and the demo seed run as the schema owner; the server connects as DB_USER, which may only read and
    // write rows.
    const { migrated, seeded } = await withSchemaOwner(config, async (owner) => ({
      migrated: await runMigrations(owner),
      seeded: await runSeeders(owner),
    }));
    say(migrated.length ? `Applied ${migrated.length} migration(s): ${migrated.join(', ')}` : 'Database schema is up to date.');
    if (seeded.length) {
      say(`Seeded demo data: ${seeded.join(', ')}`);
      say(formatDemoSignIns());
    }

    if (!dev) await buildClientIfStale(say);

    if (!config.isProduction) {
      running.catcher = await startMailCatcher({
        host: config.smtp.host,
        smtpPort: config.smtp.port,
        httpPort: config.mailcatcherHttpPort,
        dir: path.join(config.dataDir, 'mail'),
        log: say,
      });
    }

    const server = await startServer();
    running.server = server;
    running.closeDb = undefined; // server.close() closes the pool

    if (dev) {
      running.vite = spawn(process.execPath, [path.join(ROOT_DIR, 'node_modules', 'vite', 'bin', 'vite.js'), '--strictPort'], {
        cwd: ROOT_DIR,
        stdio: ['ignore', 'inherit', 'inherit'],
        env: { ...process.env, PORT: String(config.port) },
      });
      running.vite.once('exit', (code, signal) => {
        if (!stopping) shutdown(`Vite dev server exited (${code ?? signal})`, 1);
      });
    }
    printBanner(config, dev, formatDemoSignIns);
  } catch (err) {
    const message = err instanceof MissingPackagesError || err instanceof Error ? err.message : String(err);
    process.stderr.write(`\nnpm start failed: ${message}\n`);
    if (!stopping) {
      stopping = stopAll(running).then(() => process.exit(1));
    }
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) void main();
