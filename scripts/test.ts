/**
 * `npm test`: installs what the tests need from Debian when missing (as root; otherwise prints the
 * command), starts a throw-away MariaDB (.data-test, port 3417, wiped first) and mail catcher
 * (SMTP 2536, HTTP 2537), runs `vitest run` for every project (or those given: `npm test -- --project unit`),
 * stops everything (also on failure or Ctrl-C) and ends with one plain line: `N passed, N failed`
 * (`, N skipped` appended when some were skipped). Exit code 0 only when tests ran and none failed.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { ROOT_DIR } from '../server/paths';
import {
  CHROMIUM_PACKAGE,
  ensureDatabases,
  ensureDebianPackages,
  MARIADB_PACKAGE,
  POPPLER_PACKAGE,
  startMariaDb,
  stopMariaDbInDir,
  type DebianRequirement,
  type MariaDbHandle,
} from './db';
import { startMailCatcher, type MailCatcher } from './mailcatcher';
import { acquireRunLock } from './runLock';

const say = (line = '') => process.stdout.write(`${line}\n`);

/**
 * Shifts every test port by this much, so that two checkouts on one machine can run their tests at the same
 * time (`GW_TEST_PORT_OFFSET=20 npm test`). Unset means the ports listed in the README.
 */
export function testPortOffset(env: NodeJS.ProcessEnv = process.env): number {
  const raw = env.GW_TEST_PORT_OFFSET;
  if (raw === undefined || raw === '') return 0;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 1000) throw new Error(`GW_TEST_PORT_OFFSET must be a whole number from 0 to 1000, not "${raw}"`);
  return n;
}

const OFFSET = testPortOffset();

/** Test ports and names (see notes in .env.example and DEVELOPERS.md). */
export const TEST_SETTINGS = {
  dataDir: '.data-test',
  dbPort: 3417 + OFFSET,
  smtpPort: 2536 + OFFSET,
  mailcatcherHttpPort: 2537 + OFFSET,
  appPort: 5190 + OFFSET,
  apiDatabase: 'gw_test_api',
  e2eDatabase: 'gw_test_e2e',
  dbUser: 'gw_test',
  dbOwnerUser: 'gw_test_owner',
} as const;

const ALL_PROJECTS = ['unit', 'client', 'api', 'e2e'] as const;

/** The projects named with --project (both `--project x` and `--project=x`), or all of them. */
export function selectedProjects(args: string[]): string[] {
  const named: string[] = [];
  args.forEach((arg, i) => {
    if (arg === '--project' && args[i + 1]) named.push(args[i + 1]);
    else if (arg.startsWith('--project=')) named.push(arg.slice('--project='.length));
  });
  return named.length ? named : [...ALL_PROJECTS];
}

/** Debian packages the selected projects need. */
export function requiredPackages(projects: string[]): DebianRequirement[] {
  const needs: DebianRequirement[] = [];
  const has = (p: string) => projects.some((x) => x === p || x === '*' || x.includes('*'));
  if (has('api') || has('e2e')) needs.push(MARIADB_PACKAGE);
  if (has('e2e')) needs.push(CHROMIUM_PACKAGE);
  if (has('unit') || has('api') || has('e2e')) needs.push(POPPLER_PACKAGE);
  return needs;
}

type JsonReport = {
  numTotalTests?: number;
  numPassedTests?: number;
  numFailedTests?: number;
  numPendingTests?: number;
  numTodoTests?: number;
  numFailedTestSuites?: number;
  testResults?: Array<{ status?: string; message?: string; name?: string; assertionResults?: Array<{ status?: string }> }>;
};

/** Counts from vitest's JSON report. A test file that failed without any failed test (e.g. it did not load) counts as one failure. */
export function summarise(report: JsonReport): { passed: number; failed: number; skipped: number } {
  const brokenFiles = (report.testResults ?? []).filter(
    (file) => file.status === 'failed' && !(file.assertionResults ?? []).some((a) => a.status === 'failed'),
  ).length;
  return {
    passed: report.numPassedTests ?? 0,
    failed: (report.numFailedTests ?? 0) + brokenFiles,
    skipped: (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0),
  };
}

/** `N passed, N failed` plus `, N skipped` when any were skipped. */
export function summaryLine(counts: { passed: number; failed: number; skipped: number }): string {
  return `${counts.passed} passed, ${counts.failed} failed${counts.skipped ? `, ${counts.skipped} skipped` : ''}`;
}

async function main(): Promise<number> {
  const args = process.argv.slice(2);
  const projects = selectedProjects(args);
  const needsServices = projects.some((p) => p === 'api' || p === 'e2e' || p.includes('*'));
  const dataDir = path.join(ROOT_DIR, TEST_SETTINGS.dataDir);
  const reportFile = path.join(dataDir, 'vitest-report.json');

  try {
    // The lock lives outside the folder that gets wiped (and outside the repository).
    const lockName = `gantrywright-test-${createHash('sha256').update(ROOT_DIR).digest('hex').slice(0, 12)}.lock`;
    acquireRunLock(path.join(os.tmpdir(), lockName), 'npm test');
    ensureDebianPackages(requiredPackages(projects), say);
  } catch (err) {
    process.stderr.write(`${(err as Error).message}\n`);
    say(summaryLine({ passed: 0, failed: 0, skipped: 0 }));
    return 1;
  }

  let db: MariaDbHandle | undefined;
  let catcher: MailCatcher | undefined;
  let vitest: ChildProcess | undefined;
  let interrupted: NodeJS.Signals | undefined;
  const onSignal = (signal: NodeJS.Signals) => {
    if (interrupted) return;
    interrupted = signal;
    say(`\n${signal}: stopping the tests...`);
    vitest?.kill('SIGTERM');
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);

  let vitestCode: number | null = 1;
  try {
    // A test MariaDB left running by an interrupted run must stop before its folder is wiped.
    await stopMariaDbInDir(path.join(dataDir, 'mariadb'), say);
    fs.rmSync(dataDir, { recursive: true, force: true });
    fs.mkdirSync(dataDir, { recursive: true });

    const dbPassword = randomBytes(18).toString('base64url');
    const dbOwnerPassword = randomBytes(18).toString('base64url');
    if (needsServices) {
      db = await startMariaDb({ dir: path.join(dataDir, 'mariadb'), port: TEST_SETTINGS.dbPort, log: say });
      await ensureDatabases(db, {
        databases: [TEST_SETTINGS.apiDatabase, TEST_SETTINGS.e2eDatabase],
        user: TEST_SETTINGS.dbUser,
        password: dbPassword,
        owner: { user: TEST_SETTINGS.dbOwnerUser, password: dbOwnerPassword },
      });
      catcher = await startMailCatcher({
        smtpPort: TEST_SETTINGS.smtpPort,
        httpPort: TEST_SETTINGS.mailcatcherHttpPort,
        dir: path.join(dataDir, 'mail'),
        log: say,
      });
    }
    if (interrupted) throw new Error(`interrupted (${interrupted})`);

    const env: NodeJS.ProcessEnv = { ...process.env };
    // Settings from the developer's shell must not leak into the tests.
    for (const key of ['UPLOAD_DIR', 'TRUST_PROXY', 'SMTP_USER', 'SMTP_PASSWORD', 'SMTP_SECURE', 'MAIL_FROM', 'DB_POOL_MAX'])
      delete env[key];
    Object.assign(env, {
      NODE_ENV: 'test',
      LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
      GW_TEST_ORCHESTRATED: '1',
      DATA_DIR: TEST_SETTINGS.dataDir,
      HOST: '127.0.0.1',
      PORT: String(TEST_SETTINGS.appPort),
      APP_URL: `http://127.0.0.1:${TEST_SETTINGS.appPort}`,
      DB_HOST: '127.0.0.1',
      DB_PORT: String(TEST_SETTINGS.dbPort),
      DB_NAME: TEST_SETTINGS.apiDatabase,
      GW_TEST_DB_E2E: TEST_SETTINGS.e2eDatabase,
      DB_USER: TEST_SETTINGS.dbUser,
      DB_PASSWORD: dbPassword,
      DB_OWNER_USER: TEST_SETTINGS.dbOwnerUser,
      DB_OWNER_PASSWORD: dbOwnerPassword,
      JWT_SECRET: randomBytes(32).toString('base64url'),
      SESSION_HOURS: '12',
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(TEST_SETTINGS.smtpPort),
      MAILCATCHER_HTTP_PORT: String(TEST_SETTINGS.mailcatcherHttpPort),
      LOGIN_RATE_LIMIT: '5',
      LOGIN_RATE_WINDOW_MINUTES: '15',
      // Every test file signs in and asks for resets from 127.0.0.1 at once: the per-address limits are tested with
      // their own small values and client addresses (tests/api/abuse.api.test.ts), not left to trip other files.
      LOGIN_IP_RATE_LIMIT: '100000',
      RESET_IP_RATE_LIMIT: '100000',
    });

    const vitestArgs = [
      path.join(ROOT_DIR, 'node_modules', 'vitest', 'vitest.mjs'),
      'run',
      '--reporter=default',
      '--reporter=json',
      `--outputFile.json=${reportFile}`,
      ...args,
    ];
    vitestCode = await new Promise<number | null>((resolve, reject) => {
      vitest = spawn(process.execPath, vitestArgs, { cwd: ROOT_DIR, env, stdio: ['ignore', 'inherit', 'inherit'] });
      vitest.once('error', reject);
      vitest.once('exit', (code, signal) => resolve(code ?? (signal ? 128 : 1)));
    });
  } catch (err) {
    process.stderr.write(`\nTest setup failed: ${err instanceof Error ? err.message : String(err)}\n`);
    vitestCode = 1;
  } finally {
    if (catcher) await catcher.close().catch(() => undefined);
    if (db) await db.stop().catch((err: unknown) => process.stderr.write(`Could not stop the test MariaDB: ${String(err)}\n`));
  }

  let counts = { passed: 0, failed: 0, skipped: 0 };
  let reportOk = false;
  try {
    counts = summarise(JSON.parse(fs.readFileSync(reportFile, 'utf8')) as JsonReport);
    reportOk = true;
  } catch {
    process.stderr.write('No test report was written (vitest did not finish).\n');
  }
  let exitCode = 0;
  if (interrupted) exitCode = 130;
  else if (!reportOk || counts.failed > 0 || vitestCode !== 0 || counts.passed === 0) exitCode = 1;
  if (exitCode === 1 && reportOk && counts.failed === 0) {
    process.stderr.write(
      counts.passed === 0
        ? 'No tests ran (no test file matched, or vitest stopped before running any; see above).\n'
        : `vitest exited with code ${vitestCode} (errors outside the tests; see above).\n`,
    );
  }
  say(summaryLine(counts));
  return exitCode;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().then(
    (code) => process.exit(code),
    (err: unknown) => {
      process.stderr.write(`${err instanceof Error ? err.stack : String(err)}\n`);
      say(summaryLine({ passed: 0, failed: 0, skipped: 0 }));
      process.exit(1);
    },
  );
}
