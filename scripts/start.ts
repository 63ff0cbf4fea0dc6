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
import { ROOT_DIR } from '../server/paths';
import { ConfigError, getConfig, loadDotEnv, type AppConfig } from '../server/config';
import { ensureDatabases, ensureDebianPackages, MARIADB_PACKAGE, MissingPackagesError, startMariaDb, type MariaDbHandle } from './db';
import { startMailCatcher, type MailCatcher } from './mailcatcher';
import { buildClientIfStale } from './buildClient';
import { acquireRunLock } from './runLock';

const say = (line = '') => process.stdout.write(`${line}\n`);
const ENV_FILE = path.join(ROOT_DIR, '.env');
const ENV_EXAMPLE = path.join(ROOT_DIR, '.env.example');

/** Creates .env from .env.example on first run, with a random JWT secret and database password. */
export function ensureEnvFile(): void {
  const secret = () => randomBytes(32).toString('base64url');
  if (!fs.existsSync(ENV_FILE)) {
    const template = fs.readFileSync(ENV_EXAMPLE, 'utf8');
    const filled = template.replace(/^JWT_SECRET=.*$/m, `JWT_SECRET=${secret()}`).replace(/^DB_PASSWORD=.*$/m, `DB_PASSWORD=${secret()}`);
    fs.writeFileSync(ENV_FILE, filled, { mode: 0o600 });
    say('Created .env with a random JWT secret and database password.');
    return;
  }
  // An existing .env without the two secrets gets them added (never overwritten).
  let text = fs.readFileSync(ENV_FILE, 'utf8');
  let changed = false;
  for (const key of ['JWT_SECRET', 'DB_PASSWORD']) {
    const line = new RegExp(`^${key}=(.*)$`, 'm').exec(text);
    if (line && line[1].trim() !== '') continue;
    text = line ? text.replace(line[0], `${key}=${secret()}`) : `${text.replace(/\n?$/, '\n')}${key}=${secret()}\n`;
    changed = true;
  }
  if (changed) {
    fs.writeFileSync(ENV_FILE, text);
    say('Added missing JWT_SECRET / DB_PASSWORD to .env.');
  }
}

const isLocalHost = (host: string) => ['127.0.0.1', 'localhost', '::1'].includes(host);

type Running = {
  db?: MariaDbHandle;
  catcher?: MailCatcher;
  server?: { close: () => Promise<void> };
  vite?: ChildProcess;
  closeDb?: () => Promise<void>;
};

/** Stops everything that was started, newest first. Each step is attempted even if an earlier one fails. */
async function stopAll(running: Running): Promise<void> {
  const steps: Array<[string, (() => Promise<void>) | undefined]> = [
    ['Vite dev server', running.vite ? () => stopChild(running.vite!) : undefined],
    ['API server', running.server?.close],
    ['database connections', running.closeDb],
    ['mail catcher', running.catcher?.close],
    ['MariaDB', running.db ? () => running.db!.stop() : undefined],
  ];
  for (const [name, step] of steps) {
    if (!step) continue;
    try {
      await step();
      say(`Stopped ${name}.`);
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
  ensureEnvFile();
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
    const { getSequelize, closeSequelize } = await import('../server/db');
    const { runMigrations, runSeeders } = await import('../server/migrator');
    const { formatDemoSignIns } = await import('../server/seeders/demoAccounts');
    const { startServer } = await import('../server/index');

    // A list of cluster nodes (DB_NODES) is someone else's servers (e.g. tsx scripts/cluster.ts start), never the private one.
    if (isLocalHost(config.db.host) && (config.db.nodes?.length ?? 1) === 1) {
      ensureDebianPackages([MARIADB_PACKAGE], say);
      running.db = await startMariaDb({ dir: path.join(config.dataDir, 'mariadb'), port: config.db.port, log: say });
      await ensureDatabases(running.db, { databases: [config.db.name], user: config.db.user, password: config.db.password });
    } else {
      say(
        `Using the MariaDB server(s) at ${(config.db.nodes ?? [config.db]).map((n) => `${n.host}:${n.port}`).join(', ')} (not the private one).`,
      );
    }

    const sequelize = getSequelize();
    running.closeDb = closeSequelize;
    const migrated = await runMigrations(sequelize);
    say(migrated.length ? `Applied ${migrated.length} migration(s): ${migrated.join(', ')}` : 'Database schema is up to date.');
    const seeded = await runSeeders(sequelize);
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

void main();
