/**
 * A three-node MariaDB Galera cluster on loopback, for the scale test and for trying the app against a cluster:
 * one option file and data folder per node under DIR (default .data-scale/cluster), the first node bootstrapped,
 * the others joined one after the other (full state transfer by rsync), ready when every node is synced and the
 * cluster has three members. Also kills and brings back single nodes (the scale test's faults) and stops cleanly.
 *
 *   tsx scripts/cluster.ts start     [--dir D] [--base-port P]   start (initialising on first use) and leave running
 *   tsx scripts/cluster.ts status    [--dir D] [--base-port P]   one line per node
 *   tsx scripts/cluster.ts kill N    (1–3)                          SIGKILL one node, as a crash would
 *   tsx scripts/cluster.ts restart N                                bring a stopped or killed node back (incremental catch-up)
 *   tsx scripts/cluster.ts stop                                     clean shutdown, last node first to stop is node 1
 *
 * Ports (base P, default 4600 or GW_SCALE_PORT_BASE): node N serves SQL on P+20+N, Galera group traffic on
 * P+30+N, incremental state transfer on P+40+N and full state transfer on P+50+N — all on 127.0.0.1.
 *
 * Facts this relies on (proven on Debian 12, MariaDB 10.11, galera-4 26.4): `--defaults-file` keeps /etc out;
 * `ist.recv_addr` must be set (its default, group port + 1, collides with the next node); `log_bin_trust_function_creators`
 * lets the owner account create the triggers of the migrations; Debian's rsync transfer runs its daemon as `nobody`
 * when mariadbd runs as root, which cannot read a 0700 data folder — so as root every node runs as the `mysql`
 * account that owns its folder; after a kill, `--wsrep-recover` finds the last committed position and starting
 * from it needs only the missing writes (incremental transfer) instead of a full copy.
 */
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import {
  ensureDatabases,
  ensureDebianPackages,
  findBinary,
  MARIADB_PACKAGE,
  mariaDbPaths,
  runSql,
  type DbAccount,
  type DebianRequirement,
  type MariaDbPaths,
} from './db';

type Log = (line: string) => void;
const defaultLog: Log = (line) => process.stdout.write(`${line}\n`);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const isRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

/** The Galera provider library of Debian's galera-4 package (installed with mariadb-server). */
export const GALERA_PROVIDER = '/usr/lib/galera/libgalera_smm.so';

/** Debian packages a cluster needs: the server (brings galera-4) and rsync for full state transfers. */
export const CLUSTER_PACKAGES: DebianRequirement[] = [
  MARIADB_PACKAGE,
  { pkg: 'galera-4', binary: 'libgalera_smm.so', file: GALERA_PROVIDER },
  { pkg: 'rsync', binary: 'rsync' },
  { pkg: 'iproute2', binary: 'ss' },
];

/** Where the cluster lives and which ports it uses. */
export type ClusterOptions = { dir: string; basePort: number; log?: Log };

/** One node: its ports, files and option file. */
export type ClusterNode = {
  index: number;
  name: string;
  port: number;
  groupPort: number;
  istPort: number;
  sstPort: number;
  paths: MariaDbPaths;
  optionFile: string;
  grastate: string;
};

/** Galera state of one node, as far as it answers. */
export type NodeStatus = {
  node: ClusterNode;
  running: boolean;
  pid: number | null;
  state?: string;
  ready?: string;
  clusterStatus?: string;
  clusterSize?: number;
};

const CLUSTER_NAME = 'gantrywright-scale';

/** The three nodes of a cluster in `dir` with ports from `basePort`. */
export function clusterLayout(options: ClusterOptions): ClusterNode[] {
  return [1, 2, 3].map((index) => {
    const paths = mariaDbPaths(path.join(options.dir, `node${index}`));
    return {
      index,
      name: `node${index}`,
      port: options.basePort + 20 + index,
      groupPort: options.basePort + 30 + index,
      istPort: options.basePort + 40 + index,
      sstPort: options.basePort + 50 + index,
      paths,
      optionFile: path.join(paths.dir, 'node.cnf'),
      grastate: path.join(paths.dataDir, 'grastate.dat'),
    };
  });
}

/** The account mariadbd runs as: `mysql` when we are root (see the rsync note at the top), else ourselves. */
function serverAccount(): { name: string; uid: number; gid: number } | null {
  if (!isRoot()) return null;
  const result = spawnSync('id', ['-u', 'mysql'], { encoding: 'utf8' });
  const gid = spawnSync('id', ['-g', 'mysql'], { encoding: 'utf8' });
  if (result.status !== 0 || gid.status !== 0) {
    throw new Error(
      'The cluster runs its nodes as the "mysql" account when started as root, but it does not exist (it comes with mariadb-server).',
    );
  }
  return { name: 'mysql', uid: Number(result.stdout.trim()), gid: Number(gid.stdout.trim()) };
}

/** Every folder above `dir` must let the server account through, or the node cannot reach its own files. */
function assertReachable(dir: string, account: { name: string } | null): void {
  if (!account) return;
  for (let current = path.resolve(dir); current !== path.dirname(current); current = path.dirname(current)) {
    if (!fs.existsSync(current)) continue;
    const mode = fs.statSync(current).mode;
    if ((mode & 0o001) === 0) {
      throw new Error(
        `The cluster's nodes run as "${account.name}", who cannot enter ${current} (mode ${(mode & 0o777).toString(8)}). ` +
          'Put the repository where other accounts may enter, or run the scale test as a normal user.',
      );
    }
  }
}

function chownTree(target: string, account: { uid: number; gid: number } | null): void {
  if (!account) return;
  fs.chownSync(target, account.uid, account.gid);
  if (!fs.statSync(target).isDirectory()) return;
  for (const entry of fs.readdirSync(target)) chownTree(path.join(target, entry), account);
}

/** The option file of one node: everything on the command line of a normal server, plus Galera's settings. */
export function optionFileText(node: ClusterNode, all: ClusterNode[]): string {
  const lines = [
    '# Written by scripts/cluster.ts. One node of the scale-test Galera cluster; read with --defaults-file only.',
    '[mariadbd]',
    `datadir=${node.paths.dataDir}`,
    `socket=${node.paths.socket}`,
    `pid-file=${node.paths.pidFile}`,
    `port=${node.port}`,
    'bind-address=127.0.0.1',
    'skip-name-resolve',
    `log-error=${node.paths.errorLog}`,
    'character-set-server=utf8mb4',
    'collation-server=utf8mb4_unicode_ci',
    'default-time-zone=+00:00',
    'max_connections=300',
    'innodb_buffer_pool_size=96M',
    'binlog_format=ROW',
    'default_storage_engine=InnoDB',
    'innodb_autoinc_lock_mode=2',
    'log_bin_trust_function_creators=ON',
    'wsrep_on=ON',
    `wsrep_provider=${GALERA_PROVIDER}`,
    `wsrep_cluster_name=${CLUSTER_NAME}`,
    `wsrep_cluster_address=gcomm://${all.map((n) => `127.0.0.1:${n.groupPort}`).join(',')}`,
    `wsrep_node_address=127.0.0.1:${node.groupPort}`,
    `wsrep_node_name=${node.name}`,
    `wsrep_provider_options="gmcast.listen_addr=tcp://127.0.0.1:${node.groupPort};ist.recv_addr=127.0.0.1:${node.istPort};gcache.size=64M"`,
    'wsrep_sst_method=rsync',
    `wsrep_sst_receive_address=127.0.0.1:${node.sstPort}`,
    'wsrep_slave_threads=2',
    '',
  ];
  return lines.join('\n');
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

/** The pid of the mariadbd serving this node, or null. */
export function nodePid(node: ClusterNode): number | null {
  const pid = readPid(node.paths.pidFile);
  if (!pid || !isAlive(pid)) return null;
  try {
    const args = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
    return args.includes(`--defaults-file=${node.optionFile}`) ? pid : null;
  } catch {
    return null;
  }
}

function tail(file: string, lines = 20): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no error log)';
  }
}

/** Galera status of one node over its socket (null when it does not answer). */
async function wsrepStatus(node: ClusterNode): Promise<Record<string, string> | null> {
  try {
    const out = await runSql(
      node.paths,
      "SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_local_state','wsrep_local_state_comment','wsrep_ready','wsrep_cluster_status','wsrep_cluster_size');",
    );
    return Object.fromEntries(
      out
        .trim()
        .split('\n')
        .filter(Boolean)
        .map((line) => line.split('\t') as [string, string]),
    );
  } catch {
    return null;
  }
}

/** Status of every node. */
export async function clusterStatus(nodes: ClusterNode[]): Promise<NodeStatus[]> {
  return Promise.all(
    nodes.map(async (node) => {
      const pid = nodePid(node);
      const status = pid ? await wsrepStatus(node) : null;
      return {
        node,
        running: pid !== null,
        pid,
        state: status?.wsrep_local_state_comment,
        ready: status?.wsrep_ready,
        clusterStatus: status?.wsrep_cluster_status,
        clusterSize: status?.wsrep_cluster_size ? Number(status.wsrep_cluster_size) : undefined,
      };
    }),
  );
}

/** Waits until `node` is synced, ready and in the primary component (of at least `size` members). */
async function waitSynced(node: ClusterNode, size: number, timeoutMs: number, exited: () => string | null): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const gone = exited();
    if (gone)
      throw new Error(`${node.name} stopped while starting (${gone}). Last lines of ${node.paths.errorLog}:\n${tail(node.paths.errorLog)}`);
    const status = await wsrepStatus(node);
    if (
      status?.wsrep_local_state === '4' &&
      status.wsrep_ready === 'ON' &&
      status.wsrep_cluster_status === 'Primary' &&
      Number(status.wsrep_cluster_size) >= size
    )
      return;
    if (Date.now() > deadline) {
      throw new Error(
        `${node.name} did not become synced within ${Math.round(timeoutMs / 1000)} s (state ${status?.wsrep_local_state_comment ?? 'no answer'}). ` +
          `Last lines of ${node.paths.errorLog}:\n${tail(node.paths.errorLog)}`,
      );
    }
    await sleep(250);
  }
}

function mariadbd(): string {
  const found = findBinary('mariadbd');
  if (!found) throw new Error('mariadbd is missing (Debian package mariadb-server).');
  return found;
}

function userArgs(): string[] {
  const account = serverAccount();
  return account ? [`--user=${account.name}`] : [];
}

/** Starts mariadbd for a node in its own process group; resolves once it is synced in a cluster of `size`. */
async function launch(node: ClusterNode, extra: string[], size: number, log: Log): Promise<number> {
  for (const file of [node.paths.pidFile, node.paths.socket, `${node.paths.socket}.lock`]) fs.rmSync(file, { force: true });
  const child = spawn(mariadbd(), [`--defaults-file=${node.optionFile}`, ...userArgs(), ...extra], { detached: true, stdio: 'ignore' });
  let exited: string | null = null;
  child.once('exit', (code, signal) => {
    exited = `exit ${code ?? signal}`;
  });
  child.unref();
  const started = Date.now();
  await waitSynced(node, size, 180_000, () => exited);
  log(`${node.name} synced on 127.0.0.1:${node.port} after ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  return readPid(node.paths.pidFile) ?? child.pid!;
}

/** `safe_to_bootstrap` and `seqno` of a node's grastate.dat (null when it has none). */
function readGrastate(node: ClusterNode): { safe: boolean; seqno: number; uuid: string } | null {
  try {
    const text = fs.readFileSync(node.grastate, 'utf8');
    return {
      safe: /safe_to_bootstrap:\s*1/.test(text),
      seqno: Number(/seqno:\s*(-?\d+)/.exec(text)?.[1] ?? -1),
      uuid: /uuid:\s*([0-9a-f-]+)/.exec(text)?.[1] ?? '',
    };
  } catch {
    return null;
  }
}

/**
 * Asks a stopped node for the last position it committed (`--wsrep-recover` writes "Recovered position: uuid:seqno"
 * to its log and exits). @returns `uuid:seqno`, or null when it cannot tell
 */
export function recoverPosition(node: ClusterNode): string | null {
  const before = fs.existsSync(node.paths.errorLog) ? fs.statSync(node.paths.errorLog).size : 0;
  const result = spawnSync(mariadbd(), [`--defaults-file=${node.optionFile}`, ...userArgs(), '--wsrep-recover'], {
    stdio: 'ignore',
    timeout: 120_000,
  });
  if (result.status !== 0) return null;
  const log = fs.readFileSync(node.paths.errorLog, 'utf8').slice(before);
  const matches = [...log.matchAll(/Recovered position:\s*([0-9a-f-]+:-?\d+)/g)];
  return matches.length ? matches[matches.length - 1][1] : null;
}

/** Creates the data folder and option file of every node that has none yet. @returns whether any was created */
function initialise(nodes: ClusterNode[], log: Log): boolean {
  const account = serverAccount();
  let created = false;
  for (const node of nodes) {
    fs.mkdirSync(node.paths.dir, { recursive: true });
    fs.writeFileSync(node.optionFile, optionFileText(node, nodes));
    if (fs.existsSync(node.paths.marker)) continue;
    fs.rmSync(node.paths.dataDir, { recursive: true, force: true });
    assertReachable(node.paths.dir, account);
    chownTree(node.paths.dir, account);
    const adminAccount = isRoot() ? 'root' : os.userInfo().username;
    log(`Initialising ${node.name} in ${path.relative(process.cwd(), node.paths.dir) || node.paths.dir} ...`);
    const result = spawnSync(
      findBinary('mariadb-install-db') ?? 'mariadb-install-db',
      ['--no-defaults', `--user=${account?.name ?? adminAccount}`, `--datadir=${node.paths.dataDir}`, '--skip-test-db'],
      { encoding: 'utf8', timeout: 120_000 },
    );
    if (result.status !== 0) throw new Error(`mariadb-install-db failed for ${node.name}:\n${result.stderr || result.stdout}`);
    fs.writeFileSync(node.paths.marker, `initialised ${new Date().toISOString()}\n`);
    chownTree(node.paths.dir, account);
    created = true;
  }
  return created;
}

/** A running cluster. */
export type Cluster = { nodes: ClusterNode[]; stop: () => Promise<void> };

/**
 * Starts the cluster of `dir` (initialising it on first use) and resolves when all three nodes are synced. A cluster
 * that was stopped cleanly is bootstrapped from the node that stopped last; one that crashed as a whole from the
 * node with the highest recovered position. Nodes already running are left as they are.
 */
export async function startCluster(options: ClusterOptions): Promise<Cluster> {
  const log = options.log ?? defaultLog;
  ensureDebianPackages(CLUSTER_PACKAGES, log);
  const nodes = clusterLayout(options);
  initialise(nodes, log);
  const started = Date.now();

  const running = nodes.filter((n) => nodePid(n) !== null);
  if (running.length === 0) {
    // Which node may found the cluster again?
    let first = nodes.find((n) => readGrastate(n)?.safe) ?? null;
    if (!first) {
      const states = nodes.map((n) => ({ node: n, state: readGrastate(n) }));
      if (states.some((s) => s.state && s.state.seqno >= 0) || states.every((s) => !s.state)) {
        first = states.every((s) => !s.state) ? nodes[0] : states.sort((a, b) => (b.state?.seqno ?? -1) - (a.state?.seqno ?? -1))[0].node;
      } else {
        // Every node crashed: ask each for its last committed position and found the cluster on the newest.
        const positions = nodes.map((n) => ({ node: n, seqno: Number(recoverPosition(n)?.split(':')[1] ?? -1) }));
        first = positions.sort((a, b) => b.seqno - a.seqno)[0].node;
      }
      if (fs.existsSync(first.grastate)) {
        fs.writeFileSync(first.grastate, fs.readFileSync(first.grastate, 'utf8').replace(/safe_to_bootstrap:\s*0/, 'safe_to_bootstrap: 1'));
      }
    }
    log(`Bootstrapping the cluster from ${first.name} ...`);
    await launch(first, ['--wsrep-new-cluster'], 1, log);
  }
  for (const node of nodes) {
    if (nodePid(node) !== null) continue;
    const up = (await clusterStatus(nodes)).filter((s) => s.running).length;
    await launch(node, [], up + 1, log);
  }
  await waitSynced(nodes[0], 3, 60_000, () => null);
  log(
    `Galera cluster of 3 nodes ready in ${((Date.now() - started) / 1000).toFixed(1)} s (SQL ports ${nodes.map((n) => n.port).join(', ')}).`,
  );
  return { nodes, stop: () => stopCluster(options) };
}

/** Stops one node cleanly (shutdown over its socket, then SIGTERM). */
export async function stopNode(node: ClusterNode): Promise<void> {
  const pid = nodePid(node);
  if (!pid) return;
  spawnSync(
    findBinary('mariadb-admin') ?? 'mariadb-admin',
    ['--no-defaults', `--socket=${node.paths.socket}`, `-u${isRoot() ? 'root' : os.userInfo().username}`, 'shutdown'],
    {
      stdio: 'ignore',
      timeout: 60_000,
    },
  );
  const deadline = Date.now() + 60_000;
  while (isAlive(pid) && Date.now() < deadline) await sleep(100);
  if (isAlive(pid)) {
    process.kill(pid, 'SIGTERM');
    const hard = Date.now() + 30_000;
    while (isAlive(pid) && Date.now() < hard) await sleep(100);
    if (isAlive(pid)) process.kill(pid, 'SIGKILL');
  }
}

/** Stops every node, node 3 first, so node 1 stops last and may bootstrap the next start. */
export async function stopCluster(options: ClusterOptions): Promise<void> {
  const nodes = clusterLayout(options);
  for (const node of [...nodes].reverse()) await stopNode(node);
}

/** Kills a node with SIGKILL, as a crash or a power cut would. @returns the pid killed */
export function killNode(node: ClusterNode): number | null {
  const pid = nodePid(node);
  if (pid) process.kill(pid, 'SIGKILL');
  return pid;
}

/**
 * Brings a stopped or killed node back into the running cluster: recovers its last committed position first, so it
 * catches up by incremental transfer (only the writes it missed) when the others still hold them.
 * @returns seconds until it was synced
 */
export async function restartNode(node: ClusterNode, nodes: ClusterNode[], log: Log = defaultLog): Promise<number> {
  const started = Date.now();
  while (nodePid(node) !== null && Date.now() - started < 10_000) await sleep(100);
  const position = recoverPosition(node);
  const up = (await clusterStatus(nodes)).filter((s) => s.running && s.node !== node).length;
  log(`Restarting ${node.name}${position ? ` from position ${position}` : ''} ...`);
  await launch(node, position ? [`--wsrep_start_position=${position}`] : [], up + 1, log);
  return (Date.now() - started) / 1000;
}

/**
 * Creates the database and the two accounts on the cluster (DDL replicates to every node), as `npm start` does on its
 * private server (ensureDatabases in scripts/db.ts): the schema owner that runs the migrations (everything on the
 * database) and the application's account that may only read and write rows.
 */
export async function ensureClusterDatabase(
  node: ClusterNode,
  spec: { database: string; owner: DbAccount; app: DbAccount },
): Promise<void> {
  await ensureDatabases(node, { databases: [spec.database], user: spec.app.user, password: spec.app.password, owner: spec.owner });
}

/** `--name value` from argv. */
function option(args: string[], name: string): string | undefined {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : args.find((a) => a.startsWith(`${name}=`))?.slice(name.length + 1);
}

/** The port block of the scale set-up: --base-port, GW_SCALE_PORT_BASE, or 4600. */
export function scalePortBase(args: string[] = process.argv.slice(2), env: NodeJS.ProcessEnv = process.env): number {
  const raw = option(args, '--base-port') ?? env.GW_SCALE_PORT_BASE ?? '4600';
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1024 || n > 65_000)
    throw new Error(`The base port must be a whole number from 1024 to 65000, not "${raw}".`);
  return n;
}

async function cli(): Promise<number> {
  const args = process.argv.slice(2);
  const command = args[0] ?? 'status';
  const { resolveFromRoot } = await import('../server/paths');
  const options: ClusterOptions = { dir: resolveFromRoot(option(args, '--dir') ?? '.data-scale/cluster'), basePort: scalePortBase(args) };
  const nodes = clusterLayout(options);
  const pick = () => {
    const n = Number(args[1]);
    if (![1, 2, 3].includes(n)) throw new Error(`Name a node: 1, 2 or 3 (got "${args[1] ?? ''}").`);
    return nodes[n - 1];
  };
  switch (command) {
    case 'start':
      await startCluster(options);
      defaultLog('Left running; stop it with: tsx scripts/cluster.ts stop');
      return 0;
    case 'stop':
      await stopCluster(options);
      defaultLog('Cluster stopped.');
      return 0;
    case 'status': {
      const statuses = await clusterStatus(nodes);
      for (const s of statuses) {
        defaultLog(
          `${s.node.name}  127.0.0.1:${s.node.port}  ${s.running ? `pid ${s.pid}  ${s.state ?? '?'}  ready ${s.ready ?? '?'}  ${s.clusterStatus ?? '?'}  size ${s.clusterSize ?? '?'}` : 'not running'}`,
        );
      }
      return statuses.every((s) => s.running) ? 0 : 3;
    }
    case 'kill': {
      const node = pick();
      const pid = killNode(node);
      defaultLog(pid ? `Killed ${node.name} (pid ${pid}).` : `${node.name} was not running.`);
      return 0;
    }
    case 'restart': {
      const node = pick();
      const seconds = await restartNode(node, nodes);
      defaultLog(`${node.name} is back after ${seconds.toFixed(1)} s.`);
      return 0;
    }
    default:
      process.stderr.write('Usage: tsx scripts/cluster.ts start|stop|status|kill N|restart N [--dir D] [--base-port P]\n');
      return 2;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  cli().then(
    (code) => process.exit(code),
    (err: unknown) => {
      process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
      process.exit(1);
    },
  );
}
