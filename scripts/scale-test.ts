/**
 * `npm run test:scale`: Gantrywright past one machine, for real, on this machine.
 *
 * Starts a three-node MariaDB Galera cluster (scripts/cluster.ts), a fake S3 service (scripts/fakeS3.ts), the mail
 * catcher, three app processes (each preferring another database node) and HAProxy in front of them
 * (deploy/haproxy.cfg). Then simulated users walk the whole journey through the balancer — design, live results,
 * autosave, submit, approve (renders the sheet), sheet download, pluck upload — while three editors save one shared
 * design through three different processes. Meanwhile one app process and one database node are killed (SIGKILL) and
 * brought back. It reports throughput, p50/p99 latency and errors per phase, and afterwards proves that every
 * acknowledged write is present exactly once, every sheet's bytes match their SHA-256, every queued mail was sent
 * once, no update was lost, and the three nodes hold the same data.
 *
 *   npm run test:scale                        20 users, 180 s (about 4–5 minutes with set-up and checks)
 *   npm run test:scale -- --quick             8 users, 60 s, for development
 *   npm run test:scale -- --duration 300 --users 30 --base-port 4700
 *
 * Ports: a block from --base-port / GW_SCALE_PORT_BASE (default 4600): balancer +0, its statistics +1, fake S3 +5,
 * mail catcher SMTP +6 and HTTP +7, app processes +11..+13, database nodes +21..+23 (Galera +31.., +41.., +51..).
 * Everything lives in .data-scale/ (wiped at the start of each run, kept afterwards for a look; report.json has
 * the figures). Exit code: 0 when every check passed, 1 when one failed, 2 for bad arguments.
 * Needs the Debian packages mariadb-server (with galera-4), rsync, iproute2 and haproxy: installed when missing
 * as root, otherwise the exact command is printed.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Sequelize } from 'sequelize';
import { ROOT_DIR } from '../server/paths';
import {
  CLUSTER_PACKAGES,
  clusterLayout,
  ensureClusterDatabase,
  killNode,
  restartNode,
  startCluster,
  stopCluster,
  type ClusterNode,
  type ClusterOptions,
} from './cluster';
import { ensureDebianPackages, findBinary, MissingPackagesError } from './db';
import { FAKE_S3_CREDENTIALS } from './fakeS3';
import { startMailCatcher, type MailCatcher } from './mailcatcher';
import { acquireRunLock } from './runLock';
import { ScaleClient, type RequestRecord } from './scale/client';
import { abandonedStep, emptyLedger, runEditor, runJourney, type ContentionLedger, type Crew } from './scale/journey';
import { isError, phaseStats, routeStats, table, type Phase, type PhaseStats } from './scale/stats';
import { verifyRun, type Check } from './scale/verify';

const say = (line = '') => process.stdout.write(`${line}\n`);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const secret = () => randomBytes(18).toString('base64url');

/** What a run does: how long, how many users, which ports. */
export type ScaleOptions = { durationS: number; users: number; basePort: number; thinkMs: [number, number]; quick: boolean };

/** Reads the command line. @throws Error naming the bad argument (exit 2). */
export function parseScaleArgs(args: string[], env: NodeJS.ProcessEnv = process.env): ScaleOptions {
  const quick = args.includes('--quick');
  const value = (name: string) => {
    const i = args.indexOf(name);
    if (i >= 0) return args[i + 1];
    return args.find((a) => a.startsWith(`${name}=`))?.slice(name.length + 1);
  };
  const known = new Set(['--quick', '--duration', '--users', '--base-port']);
  for (const arg of args) {
    const name = arg.split('=')[0];
    if (arg.startsWith('--') && !known.has(name))
      throw new Error(`Unknown option ${name}. Options: --quick, --duration <s>, --users <n>, --base-port <p>.`);
  }
  const int = (name: string, raw: string | undefined, fallback: number, min: number, max: number) => {
    if (raw === undefined) return fallback;
    const n = Number(raw);
    if (!Number.isInteger(n) || n < min || n > max) throw new Error(`${name} must be a whole number from ${min} to ${max}, not "${raw}".`);
    return n;
  };
  return {
    quick,
    durationS: int('--duration', value('--duration') ?? env.GW_SCALE_DURATION, quick ? 60 : 180, 30, 3600),
    users: int('--users', value('--users') ?? env.GW_SCALE_USERS, quick ? 8 : 20, 1, 200),
    basePort: int('--base-port', value('--base-port') ?? env.GW_SCALE_PORT_BASE, 4600, 1024, 65_000),
    thinkMs: [150, 600],
  };
}

const HAPROXY_PACKAGE = { pkg: 'haproxy', binary: 'haproxy' };
const DATA_DIR = path.join(ROOT_DIR, '.data-scale');
const PIDS_FILE = path.join(DATA_DIR, 'pids.json');
const DB_NAME = 'gantrywright_scale';
const BUCKET = 'gantrywright-scale';
const SCALE_PASSWORD = 'scale-test-password';

type Ports = { balancer: number; stats: number; s3: number; smtp: number; catcherHttp: number; apps: number[] };

function portsOf(base: number): Ports {
  return { balancer: base, stats: base + 1, s3: base + 5, smtp: base + 6, catcherHttp: base + 7, apps: [base + 11, base + 12, base + 13] };
}

function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    socket.setTimeout(500);
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

/** A child process of the run, remembered in .data-scale/pids.json so a crashed run's leftovers can be stopped. */
type Child = { name: string; proc: ChildProcess; log: string };

function rememberPids(children: Child[]): void {
  fs.writeFileSync(
    PIDS_FILE,
    JSON.stringify(
      children.filter((c) => c.proc.pid).map((c) => ({ name: c.name, pid: c.proc.pid })),
      null,
      2,
    ),
  );
}

/** Stops processes an earlier, interrupted run left behind (only those it recorded, and only if they still are ours). */
async function stopLeftovers(clusterOptions: ClusterOptions): Promise<void> {
  try {
    const list = JSON.parse(fs.readFileSync(PIDS_FILE, 'utf8')) as Array<{ name: string; pid: number }>;
    for (const { name, pid } of list) {
      try {
        const cmdline = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8');
        if (cmdline.includes(ROOT_DIR) || cmdline.includes('haproxy') || cmdline.includes('fakeS3')) {
          process.kill(pid, 'SIGKILL');
          say(`Stopped ${name} (pid ${pid}) left by an earlier run.`);
        }
      } catch {
        // gone already
      }
    }
  } catch {
    // no earlier run
  }
  await stopCluster(clusterOptions);
}

function spawnLogged(name: string, command: string, args: string[], env: NodeJS.ProcessEnv, children: Child[]): Child {
  const log = path.join(DATA_DIR, 'logs', `${name}.log`);
  fs.mkdirSync(path.dirname(log), { recursive: true });
  const fd = fs.openSync(log, 'a');
  const proc = spawn(command, args, { cwd: ROOT_DIR, env, stdio: ['ignore', fd, fd], detached: true });
  fs.closeSync(fd);
  const child = { name, proc, log };
  children.push(child);
  rememberPids(children);
  return child;
}

async function waitFor(what: string, check: () => Promise<boolean>, timeoutMs: number, child?: Child): Promise<number> {
  const started = Date.now();
  for (;;) {
    if (child && child.proc.exitCode !== null) {
      throw new Error(`${what}: the process exited (${child.proc.exitCode}). Last lines of ${child.log}:\n${tailFile(child.log)}`);
    }
    if (await check().catch(() => false)) return Date.now() - started;
    if (Date.now() - started > timeoutMs)
      throw new Error(`${what} did not happen within ${timeoutMs / 1000} s${child ? `; see ${child.log}` : ''}.`);
    await sleep(200);
  }
}

function tailFile(file: string, lines = 15): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no log)';
  }
}

const healthy = (url: string) => async () => (await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(2000) })).status === 200;

/** Stops a child: SIGTERM, then SIGKILL after `graceMs`. */
async function stopChild(child: Child, graceMs = 10_000): Promise<void> {
  if (child.proc.exitCode !== null || child.proc.signalCode !== null) return;
  const exited = new Promise<void>((resolve) => child.proc.once('exit', () => resolve()));
  child.proc.kill('SIGTERM');
  const timer = setTimeout(() => child.proc.kill('SIGKILL'), graceMs);
  await exited;
  clearTimeout(timer);
}

/** HAProxy's view of the app processes: UP/DOWN per server, sampled during the run. */
type BalancerEvent = { at: number; server: string; status: string };

async function balancerStatus(statsPort: number): Promise<Record<string, string>> {
  const res = await fetch(`http://127.0.0.1:${statsPort}/;csv`, { signal: AbortSignal.timeout(1000) });
  const [header, ...lines] = (await res.text()).trim().split('\n');
  const cols = header.replace(/^# /, '').split(',');
  const [px, sv, st] = ['pxname', 'svname', 'status'].map((c) => cols.indexOf(c));
  const out: Record<string, string> = {};
  for (const line of lines) {
    const cells = line.split(',');
    if (cells[px] === 'app_processes' && /^app\d$/.test(cells[sv])) out[cells[sv]] = cells[st].split(' ')[0];
  }
  return out;
}

/** What the probes before the load found (each one a cross-process behaviour). */
type Probe = { name: string; ok: boolean; detail: string; informational?: boolean };

async function runProbes(lb: string, origin: string, ports: Ports, designerEmail: string): Promise<Probe[]> {
  const probes: Probe[] = [];
  const ignore = () => undefined;

  // A session made on one process works on every other.
  const user = new ScaleClient(lb, origin, ignore);
  const login = await user.post('/api/auth/login', { email: designerEmail, password: SCALE_PASSWORD });
  const served = new Set<string>();
  let meOk = 0;
  for (let i = 0; i < 9; i += 1) {
    const me = await user.get('/api/auth/me');
    if (me.status === 200) meOk += 1;
    served.add(me.headers.get('x-served-by') ?? '?');
  }
  probes.push({
    name: 'one session, every process',
    ok: login.status === 200 && meOk === 9 && served.size === 3,
    detail: `signed in once, 9 requests answered 200 by ${[...served].sort().join(', ')}`,
  });

  // Live results (the engine over HTTP) from every process.
  const design = await user.post<{ inputs: unknown; id: number }>('/api/designs', { template: 'corexy', name: `Probe ${Date.now()}` });
  const calcServed = new Set<string>();
  let calcOk = 0;
  for (let i = 0; i < 6; i += 1) {
    const res = await user.post('/api/calc', { design: design.body?.inputs });
    if (res.status === 200) calcOk += 1;
    calcServed.add(res.headers.get('x-served-by') ?? '?');
  }
  probes.push({
    name: 'live results from every process',
    ok: design.status === 201 && calcOk === 6 && calcServed.size === 3,
    detail: `6 calculations answered 200 by ${[...calcServed].sort().join(', ')}`,
  });

  // The sign-in rate limit is one count shared by every process (LOGIN_RATE_LIMIT=5 in this run).
  const attacker = new ScaleClient(lb, origin, ignore);
  const statuses: number[] = [];
  const limitServed = new Set<string>();
  const target = `rate-probe-${randomBytes(3).toString('hex')}@example.test`;
  for (let i = 0; i < 7; i += 1) {
    const res = await attacker.post('/api/auth/login', { email: target, password: 'wrong-password-1' });
    statuses.push(res.status);
    limitServed.add(res.headers.get('x-served-by') ?? '?');
  }
  probes.push({
    name: 'sign-in rate limit shared by every process',
    ok: statuses.slice(0, 5).every((s) => s === 401) && statuses.slice(5).every((s) => s === 429) && limitServed.size >= 2,
    detail: `7 wrong passwords for one address through ${limitServed.size} processes: ${statuses.join(' ')}`,
  });

  // A cross-site write (another site's page posting with the user's cookie): whichever process answers refuses it.
  const crossSite: number[] = [];
  const crossSiteServed = new Set<string>();
  for (let i = 0; i < 6; i += 1) {
    const res = await user.request('POST', '/api/designs', {
      json: { template: 'hbot', name: `Cross-site probe ${i}` },
      origin: 'https://elsewhere.example.test',
    });
    crossSite.push(res.status);
    crossSiteServed.add(res.headers.get('x-served-by') ?? '?');
  }
  probes.push({
    name: 'cross-site write refused by every process (Origin of another site)',
    ok: crossSite.every((s) => s === 403) && crossSiteServed.size >= 2,
    detail: `answered ${crossSite.join(' ')} through ${crossSiteServed.size} processes`,
  });

  // Each process answers on its own port too (the editors use them directly).
  for (const [i, port] of ports.apps.entries()) {
    const ok = await healthy(`http://127.0.0.1:${port}`)();
    if (!ok) probes.push({ name: `app${i + 1} healthy`, ok, detail: `port ${port}` });
  }
  return probes;
}

type Report = {
  options: ScaleOptions;
  setupSeconds: Record<string, number>;
  probes: Probe[];
  phases: PhaseStats[];
  routes: ReturnType<typeof routeStats>;
  faults: Record<string, number | string>;
  editors: { requests: number; errors: number; acknowledged: number; conflicts: number };
  checks: Check[];
  passed: boolean;
  failures: string[];
};

async function main(): Promise<number> {
  let options: ScaleOptions;
  try {
    options = parseScaleArgs(process.argv.slice(2));
  } catch (err) {
    process.stderr.write(`${(err as Error).message}\n`);
    return 2;
  }
  const ports = portsOf(options.basePort);
  const clusterOptions: ClusterOptions = { dir: path.join(DATA_DIR, 'cluster'), basePort: options.basePort, log: say };
  const lb = `http://127.0.0.1:${ports.balancer}`;
  const origin = lb;
  const setupSeconds: Record<string, number> = {};
  const t0 = Date.now();
  const lap = (what: string, since: number) => {
    setupSeconds[what] = Math.round((Date.now() - since) / 100) / 10;
  };

  say(
    `Scale test: ${options.users} users for ${options.durationS} s${options.quick ? ' (quick)' : ''}, ports ${options.basePort}–${options.basePort + 53}.`,
  );
  try {
    acquireRunLock(path.join(os.tmpdir(), `gantrywright-scale-${options.basePort}.lock`), 'npm run test:scale');
    ensureDebianPackages([...CLUSTER_PACKAGES, HAPROXY_PACKAGE], say);
  } catch (err) {
    process.stderr.write(`${(err as Error).message}\n`);
    say('Scale test: not run (set-up failed).');
    return 1;
  }

  const children: Child[] = [];
  let catcher: MailCatcher | undefined;
  const dbs: Sequelize[] = [];
  let report: Report | undefined;
  let interrupted = false;
  const onSignal = () => {
    interrupted = true;
    say('\nInterrupted: stopping everything...');
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
  // Should this process die unexpectedly, nothing it started may outlive it (a clean run has stopped them already).
  const killEverything = () => {
    for (const child of children) if (child.proc.exitCode === null && child.proc.signalCode === null) child.proc.kill('SIGKILL');
    for (const node of clusterLayout(clusterOptions)) killNode(node);
  };
  process.once('exit', killEverything);

  try {
    await stopLeftovers(clusterOptions);
    fs.rmSync(DATA_DIR, { recursive: true, force: true });
    fs.mkdirSync(DATA_DIR, { recursive: true });
    const nodes = clusterLayout(clusterOptions);
    const busy = [];
    for (const port of [
      ports.balancer,
      ports.stats,
      ports.s3,
      ports.smtp,
      ports.catcherHttp,
      ...ports.apps,
      ...nodes.flatMap((n) => [n.port, n.groupPort, n.istPort, n.sstPort]),
    ]) {
      if (await portInUse(port)) busy.push(port);
    }
    if (busy.length) throw new Error(`Ports already in use: ${busy.join(', ')}. Choose another block with --base-port.`);

    // 1. The database cluster, its database and the two accounts (owner runs migrations, the app only reads and writes rows).
    let since = Date.now();
    await startCluster(clusterOptions);
    const owner = { user: 'gw_owner', password: secret() };
    const app = { user: 'gw_app', password: secret() };
    await ensureClusterDatabase(nodes[0], { database: DB_NAME, owner, app });
    lap('cluster (3 nodes synced)', since);

    // 2. The fake S3 service and the mail catcher.
    since = Date.now();
    const s3 = spawnLogged(
      'fake-s3',
      process.execPath,
      [
        '--import',
        'tsx',
        path.join(ROOT_DIR, 'scripts', 'fakeS3.ts'),
        '--port',
        String(ports.s3),
        '--dir',
        path.join(DATA_DIR, 's3'),
        '--bucket',
        BUCKET,
      ],
      { ...process.env },
      children,
    );
    await waitFor('fake S3', () => portInUse(ports.s3), 30_000, s3);
    catcher = await startMailCatcher({ smtpPort: ports.smtp, httpPort: ports.catcherHttp, dir: path.join(DATA_DIR, 'mail'), log: say });
    lap('fake S3 and mail catcher', since);

    // 3. Configuration shared by the app processes and this runner (which migrates, seeds and checks as the owner).
    const nodeList = nodes.map((n) => `127.0.0.1:${n.port}`);
    const shared: NodeJS.ProcessEnv = {
      NODE_ENV: 'production',
      LOG_LEVEL: 'warn',
      HOST: '127.0.0.1',
      APP_URL: origin,
      TRUST_PROXY: 'loopback',
      DB_NAME,
      DB_POOL_MAX: '8',
      DB_SYNC_WAIT: '1',
      JWT_SECRET: secret() + secret(),
      SESSION_HOURS: '12',
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(ports.smtp),
      MAILCATCHER_HTTP_PORT: String(ports.catcherHttp),
      MAIL_WORKER_INTERVAL_SECONDS: '5',
      MAIL_CLAIM_SECONDS: '70',
      DATA_DIR: path.join(DATA_DIR, 'app'),
      STORAGE: 's3',
      S3_ENDPOINT: `http://127.0.0.1:${ports.s3}`,
      S3_BUCKET: BUCKET,
      S3_REGION: 'us-east-1',
      S3_ACCESS_KEY_ID: FAKE_S3_CREDENTIALS.accessKeyId,
      S3_SECRET_ACCESS_KEY: FAKE_S3_CREDENTIALS.secretAccessKey,
      LOGIN_RATE_LIMIT: '5',
      LOGIN_RATE_WINDOW_MINUTES: '15',
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
      // Whatever a developer's .env says about these must not reach the run (empty means the default).
      DB_READ_REPLICAS: '',
      UPLOAD_DIR: '',
      S3_PREFIX: '',
      S3_FORCE_PATH_STYLE: 'true',
      SMTP_USER: '',
      SMTP_PASSWORD: '',
      SMTP_SECURE: 'false',
    };
    // The same two accounts as npm start and npm test: DB_USER for the app, DB_OWNER_* for schema work only.
    Object.assign(process.env, shared, {
      DB_NODES: nodeList.join(','),
      DB_USER: app.user,
      DB_PASSWORD: app.password,
      DB_OWNER_USER: owner.user,
      DB_OWNER_PASSWORD: owner.password,
      LOG_LEVEL: 'error',
    });

    since = Date.now();
    const { createSequelize } = await import('../server/db');
    const { getConfig } = await import('../server/config');
    const { runMigrations, runSeeders, schemaOwnerDb } = await import('../server/migrator');
    const ownerDb = createSequelize({ ...schemaOwnerDb(getConfig()), poolMax: 8 });
    dbs.push(ownerDb);
    const migrated = await runMigrations(ownerDb);
    const seeded = await runSeeders(ownerDb);
    const { User } = await import('../server/models');
    const { hashPassword } = await import('../server/services/auth.service');
    const passwordHash = await hashPassword(SCALE_PASSWORD);
    const email = (role: string, i: number) => `scale-${role}-${i}@example.test`;
    const reviewers = 4;
    const makers = 4;
    for (let i = 0; i < options.users; i += 1)
      await User.create({ email: email('designer', i), name: `Scale designer ${i}`, roles: ['designer'], disabled: false, passwordHash });
    for (let i = 0; i < reviewers; i += 1)
      await User.create({ email: email('reviewer', i), name: `Scale reviewer ${i}`, roles: ['reviewer'], disabled: false, passwordHash });
    for (let i = 0; i < makers; i += 1)
      await User.create({ email: email('maker', i), name: `Scale maker ${i}`, roles: ['maker'], disabled: false, passwordHash });
    await User.create({ email: email('editor', 0), name: 'Scale editor', roles: ['designer'], disabled: false, passwordHash });
    lap(`schema (${migrated.length} migrations), demo seed (${seeded.length}) and ${options.users + reviewers + makers + 1} users`, since);

    // 4. Three app processes, each trying the database nodes in another order (writes land on all three nodes).
    since = Date.now();
    const rotated = (i: number) => [...nodeList.slice(i), ...nodeList.slice(0, i)].join(',');
    const appEnv = (i: number): NodeJS.ProcessEnv => ({
      ...process.env,
      ...shared,
      PORT: String(ports.apps[i]),
      DB_NODES: rotated(i),
      DB_USER: app.user,
      DB_PASSWORD: app.password,
      // The app processes never hold the owner's password (empty means not set).
      DB_OWNER_PASSWORD: '',
    });
    const startApp = (i: number) =>
      spawnLogged(`app${i + 1}`, process.execPath, ['--import', 'tsx', path.join(ROOT_DIR, 'server', 'index.ts')], appEnv(i), children);
    const apps: Child[] = [startApp(0), startApp(1), startApp(2)];
    await Promise.all(apps.map((a, i) => waitFor(`app${i + 1} healthy`, healthy(`http://127.0.0.1:${ports.apps[i]}`), 90_000, a)));
    lap('3 app processes healthy', since);

    // 5. The balancer.
    since = Date.now();
    const haproxy = spawnLogged(
      'haproxy',
      findBinary('haproxy') ?? 'haproxy',
      ['-f', path.join(ROOT_DIR, 'deploy', 'haproxy.cfg'), '-db'],
      {
        ...process.env,
        GW_LB_BIND: `127.0.0.1:${ports.balancer}`,
        GW_LB_STATS_BIND: `127.0.0.1:${ports.stats}`,
        GW_APP1: `127.0.0.1:${ports.apps[0]}`,
        GW_APP2: `127.0.0.1:${ports.apps[1]}`,
        GW_APP3: `127.0.0.1:${ports.apps[2]}`,
      },
      children,
    );
    await waitFor(
      'balancer with 3 servers up',
      async () => Object.values(await balancerStatus(ports.stats)).filter((s) => s === 'UP').length === 3,
      30_000,
      haproxy,
    );
    lap('HAProxy with 3 servers up', since);
    say(
      `Set-up done in ${((Date.now() - t0) / 1000).toFixed(1)} s: ${Object.entries(setupSeconds)
        .map(([k, v]) => `${k} ${v} s`)
        .join('; ')}.`,
    );

    // 6. Probes: sessions, live results, rate limit and the cross-site check across processes.
    const probes = await runProbes(lb, origin, ports, email('designer', 0));
    for (const p of probes) say(`  probe: ${p.name}: ${p.ok ? 'ok' : 'FAILED'}${p.informational ? ' (informational)' : ''} — ${p.detail}`);

    // 7. The load, with faults on a schedule.
    const requests: RequestRecord[] = [];
    const editorRequests: RequestRecord[] = [];
    const journeyEnds: number[] = [];
    const ledger = emptyLedger();
    const bugs: string[] = [];
    let stopping = false;
    const record = (r: RequestRecord) => requests.push(r);
    const runTag = randomBytes(3).toString('hex');

    const signedIn = async (emailAddress: string): Promise<ScaleClient> => {
      const client = new ScaleClient(lb, origin, record);
      for (let attempt = 0; attempt < 20; attempt += 1) {
        if ((await client.post('/api/auth/login', { email: emailAddress, password: SCALE_PASSWORD })).status === 200) return client;
        await sleep(500);
      }
      throw new Error(`${emailAddress} could not sign in`);
    };
    const crews: Crew[] = [];
    for (let i = 0; i < options.users; i += 1) {
      crews.push({
        designer: await signedIn(email('designer', i)),
        reviewer: await signedIn(email('reviewer', i % reviewers)),
        maker: await signedIn(email('maker', i % makers)),
      });
    }
    // The shared design of the editors.
    const editorRecord = (r: RequestRecord) => editorRequests.push(r);
    const editorBase = new ScaleClient(lb, origin, editorRecord);
    await editorBase.post('/api/auth/login', { email: email('editor', 0), password: SCALE_PASSWORD });
    const sharedDesign = await editorBase.post<{ id: number; version: number }>('/api/designs', {
      template: 'corexy',
      name: 'Shared stage',
    });
    if (sharedDesign.status !== 201) throw new Error(`could not create the shared design (${sharedDesign.status})`);
    const contention: ContentionLedger = {
      designId: sharedDesign.body.id,
      initialVersion: sharedDesign.body.version,
      acks: [],
      conflicts: 0,
      unanswered: [],
    };

    const events: BalancerEvent[] = [];
    let lastStatus: Record<string, string> = {};
    const sampler = setInterval(() => {
      balancerStatus(ports.stats)
        .then((status) => {
          for (const [server, st] of Object.entries(status)) {
            if (lastStatus[server] !== st) events.push({ at: Date.now(), server, status: st });
          }
          lastStatus = status;
        })
        .catch(() => undefined);
    }, 250);

    const D = options.durationS * 1000;
    const loadStart = Date.now();
    say(`Load: ${options.users} users and 3 editors for ${options.durationS} s...`);
    const users = crews.map(async (crew, i) => {
      // Users arrive over the first seconds instead of all at once (which would start with every sheet rendering together).
      await sleep((i * Math.min(10_000, D / 10)) / options.users);
      while (!stopping && !interrupted) {
        try {
          await runJourney(crew, ledger, { tag: `Scale ${runTag} u${i}`, thinkMs: options.thinkMs });
          journeyEnds.push(Date.now());
        } catch (err) {
          const step = abandonedStep(err);
          if (!step) {
            bugs.push(`user ${i}: ${(err as Error).stack ?? String(err)}`);
            return;
          }
          ledger.abandoned[step] = (ledger.abandoned[step] ?? 0) + 1;
          await sleep(500);
        }
      }
    });
    const editors = [0, 1, 2].map((w) =>
      runEditor(editorBase.withBase(`http://127.0.0.1:${ports.apps[w]}`), editorBase, w + 1, contention, () => stopping || interrupted),
    );

    // Faults, one after the other, each situation lasting a share of the duration (at least a few seconds; the run
    // is extended if restarts take longer than planned): steady, app2 killed, app2 restarting, all up again,
    // database node1 killed, node1 rejoining, all back.
    const hold = (share: number, minS: number) => sleep(Math.max(share * D, minS * 1000));
    const marks: Array<{ at: number; name: string }> = [{ at: loadStart, name: 'steady (all up)' }];
    const faults: Record<string, number | string> = {};
    const killedSenders = new Set<string>();
    const since0 = (t: number) => `${((t - loadStart) / 1000).toFixed(0)} s`;
    const faultPlan = (async () => {
      await hold(0.15, 8);
      if (interrupted) return;
      const killedAt = Date.now();
      killedSenders.add(`${apps[1].proc.pid}@${os.hostname()}`);
      apps[1].proc.kill('SIGKILL');
      marks.push({ at: killedAt, name: 'app2 killed' });
      say(`  ${since0(killedAt)}: killed app2 (SIGKILL)`);
      await hold(0.15, 8);
      if (interrupted) return;
      const restartAt = Date.now();
      marks.push({ at: restartAt, name: 'app2 restarting' });
      apps[1] = startApp(1);
      faults['app2 start to healthy [s]'] =
        Math.round((await waitFor('app2 healthy again', healthy(`http://127.0.0.1:${ports.apps[1]}`), 120_000, apps[1])) / 100) / 10;
      await waitFor('app2 back in the balancer', async () => (await balancerStatus(ports.stats)).app2 === 'UP', 30_000);
      marks.push({ at: Date.now(), name: 'all up again' });
      faults['app2 restart to back in the balancer [s]'] = Math.round((Date.now() - restartAt) / 100) / 10;
      say(`  ${since0(Date.now())}: app2 back in the balancer`);
      const down = events.find((e) => e.server === 'app2' && e.status === 'DOWN' && e.at >= killedAt);
      if (down) faults['app2 kill to taken out by health checks [s]'] = Math.round((down.at - killedAt) / 100) / 10;

      await hold(0.1, 6);
      if (interrupted) return;
      const nodeKilledAt = Date.now();
      killNode(nodes[0]);
      marks.push({ at: nodeKilledAt, name: 'db node1 killed' });
      say(`  ${since0(nodeKilledAt)}: killed database node1 (SIGKILL)`);
      await hold(0.15, 10);
      if (interrupted) return;
      marks.push({ at: Date.now(), name: 'db node1 rejoining' });
      faults['db node1 restart to synced [s]'] = Math.round((await restartNode(nodes[0], nodes, say)) * 10) / 10;
      marks.push({ at: Date.now(), name: 'all back' });
      say(`  ${since0(Date.now())}: database node1 synced again`);
      await hold(0.2, 15);
    })();

    await faultPlan.catch((err: unknown) => bugs.push(`fault plan: ${(err as Error).message}`));
    await sleep(Math.max(0, loadStart + D - Date.now()));
    stopping = true;
    say('Load time is up: letting running journeys finish...');
    await Promise.race([Promise.all([...users, ...editors]), sleep(120_000)]);
    const loadEnd = Date.now();
    clearInterval(sampler);

    // 8. Mail: wait until every queued mail is sent (a killed process's claims expire after MAIL_CLAIM_SECONDS).
    since = Date.now();
    const { QueryTypes } = await import('sequelize');
    const pendingMail = async () =>
      Number(
        (
          await ownerDb.query<{ n: number | string }>("SELECT COUNT(*) AS n FROM mail_queue WHERE status = 'pending'", {
            type: QueryTypes.SELECT,
          })
        )[0].n,
      );
    await waitFor('every queued mail sent', async () => (await pendingMail()) === 0, 150_000).catch((err: unknown) =>
      bugs.push((err as Error).message),
    );
    await sleep(1500);
    faults['mail queue drained after the load [s]'] = Math.round((Date.now() - since) / 100) / 10;

    // 9. Stop the balancer and the apps, so the checks see data at rest.
    for (const child of [haproxy, ...apps]) await stopChild(child);

    // 10. The checks.
    say('Checking...');
    const { S3ContentStore } = await import('../server/storage');
    const { queuedMessageId } = await import('../server/services/notify.service');
    const store = new S3ContentStore({
      bucket: BUCKET,
      prefix: '',
      region: 'us-east-1',
      endpoint: `http://127.0.0.1:${ports.s3}`,
      forcePathStyle: true,
      credentials: FAKE_S3_CREDENTIALS,
    });
    const nodeDbs = nodes.map((n: ClusterNode) =>
      createSequelize({ ...getConfig().db, nodes: [{ host: '127.0.0.1', port: n.port }], host: '127.0.0.1', port: n.port, poolMax: 1 }),
    );
    dbs.push(...nodeDbs);
    for (const nodeDb of nodeDbs) await nodeDb.query('SET SESSION wsrep_sync_wait = 1');
    const checks = await verifyRun({
      db: ownerDb,
      nodeDbs,
      store,
      ledger,
      contention,
      mails: catcher.messages(),
      messageIdOf: (id) => queuedMessageId(id),
      killedSenders,
    });

    // 11. The figures per phase.
    marks.push({ at: loadEnd, name: 'end' });
    const phases: Phase[] = marks.slice(0, -1).map((m, i) => ({ name: m.name, start: m.at, end: marks[i + 1].at }));
    const stats = phaseStats(phases, requests, journeyEnds);
    const server500 = [...requests, ...editorRequests].filter((r) => r.status === 500);
    const editorErrors = editorRequests.filter(isError).length;
    const lastPhase = stats[stats.length - 1];
    const failures: string[] = [];
    if (bugs.length) failures.push(...bugs.map((b) => `error in the run: ${b.split('\n')[0]}`));
    for (const c of checks) if (!c.ok) failures.push(`check failed: ${c.name} (${c.detail})`);
    for (const p of probes) if (!p.ok && !p.informational) failures.push(`probe failed: ${p.name} (${p.detail})`);
    if (server500.length)
      failures.push(
        `${server500.length} answers were 500 (a bug): ${[...new Set(server500.map((r) => `${r.method} ${r.route}`))].join(', ')}`,
      );
    for (const s of stats) if (s.requests === 0) failures.push(`no requests in phase "${s.name}"`);
    if (lastPhase && lastPhase.name === 'all back' && lastPhase.errors > 0)
      failures.push(`${lastPhase.errors} errors after everything was back`);
    if (phases.length < 6 && !interrupted) failures.push('the fault schedule did not complete (run longer: --duration)');
    if (journeyEnds.length < options.users) failures.push(`only ${journeyEnds.length} journeys completed for ${options.users} users`);
    if (!events.some((e) => e.server === 'app2' && e.status === 'DOWN')) failures.push('the balancer never took the killed app2 out');
    if (interrupted) failures.push('interrupted');

    report = {
      options,
      setupSeconds,
      probes,
      phases: stats,
      routes: routeStats(requests),
      faults,
      editors: {
        requests: editorRequests.length,
        errors: editorErrors,
        acknowledged: contention.acks.length,
        conflicts: contention.conflicts,
      },
      checks,
      passed: failures.length === 0,
      failures,
    };
    fs.writeFileSync(
      path.join(DATA_DIR, 'report.json'),
      JSON.stringify(
        {
          ...report,
          abandoned: ledger.abandoned,
          balancerEvents: events,
          errors: [...requests, ...editorRequests]
            .filter(isError)
            .map((r) => ({ ...r, at: new Date(r.at).toISOString(), sinceStart: (r.at - loadStart) / 1000 })),
        },
        null,
        2,
      ),
    );

    say('');
    say(
      table(
        ['phase', 's', 'requests', 'req/s', 'journeys', 'p50 ms', 'p99 ms', 'errors', 'error kinds'],
        stats.map((s) => [
          s.name,
          s.seconds,
          s.requests,
          s.perSecond,
          s.journeys,
          s.p50Ms,
          s.p99Ms,
          s.errors,
          Object.entries(s.errorKinds)
            .map(([k, n]) => `${k}×${n}`)
            .join(', ') || '-',
        ]),
      ),
    );
    say('');
    const routes = routeStats(requests);
    say(
      table(
        ['request (whole run)', 'count', 'p50 ms', 'p99 ms', 'errors'],
        routes.map((r) => [r.route, r.requests, r.p50Ms, r.p99Ms, r.errors]),
      ),
    );
    const total = requests.length;
    const totalErrors = requests.filter(isError).length;
    say('');
    say(
      `Total: ${total} requests in ${((loadEnd - loadStart) / 1000).toFixed(0)} s (${(total / ((loadEnd - loadStart) / 1000)).toFixed(1)}/s), ` +
        `${journeyEnds.length} journeys completed, ${totalErrors} errors (${((100 * totalErrors) / Math.max(1, total)).toFixed(2)} %); ` +
        `abandoned journeys: ${
          Object.entries(ledger.abandoned)
            .map(([k, n]) => `${k} ${n}`)
            .join(', ') || 'none'
        }.`,
    );
    const editorKinds = new Map<string, number>();
    for (const r of editorRequests.filter(isError))
      editorKinds.set(`${r.status}${r.code ? ` ${r.code}` : ''}`, (editorKinds.get(`${r.status}${r.code ? ` ${r.code}` : ''}`) ?? 0) + 1);
    say(
      `Editors of one shared design: ${editorRequests.length} requests, ${contention.acks.length} saves acknowledged, ${contention.conflicts} refused as stale, ` +
        `${editorErrors} errors${editorKinds.size ? ` (${[...editorKinds].map(([k, n]) => `${k}×${n}`).join(', ')})` : ''}.`,
    );
    say(
      `Faults: ${Object.entries(faults)
        .map(([k, v]) => `${k} ${v}`)
        .join('; ')}.`,
    );
    say('');
    for (const c of checks) say(`  ${c.ok ? 'ok  ' : 'FAIL'}  ${c.name}: ${c.detail}`);
    say('');
  } catch (err) {
    const message = err instanceof MissingPackagesError || err instanceof Error ? err.message : String(err);
    process.stderr.write(`\nScale test failed to run: ${message}\n`);
  } finally {
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    for (const child of [...children].reverse()) await stopChild(child).catch(() => undefined);
    for (const db of dbs) await db.close().catch(() => undefined);
    if (catcher) await catcher.close().catch(() => undefined);
    await stopCluster(clusterOptions).catch((err: unknown) => process.stderr.write(`Could not stop the cluster: ${String(err)}\n`));
    fs.rmSync(PIDS_FILE, { force: true });
  }
  if (!report) {
    say('Scale test: FAILED (did not complete).');
    return 1;
  }
  if (report.passed) {
    say(`Scale test: PASSED (${report.checks.length} checks, report in .data-scale/report.json).`);
    return 0;
  }
  say('Scale test: FAILED');
  for (const f of report.failures) say(`  - ${f}`);
  return 1;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().then(
    (code) => process.exit(code),
    (err: unknown) => {
      process.stderr.write(`${err instanceof Error ? err.stack : String(err)}\n`);
      process.exit(1);
    },
  );
}
