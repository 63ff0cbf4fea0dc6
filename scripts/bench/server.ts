import { fork, spawnSync, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { evaluateDesign } from '@/engine';
import { ROOT_DIR } from '../../server/paths';
import { baselineCheckout, BENCH_DB, BENCH_PORTS, benchEnv, Client, startApp, type AppProcess } from './env';
import { atLeast, atMost, info, median, percentile, readRecorded, say, setRecordedBaseline, sleep, type Figure } from './lib';

/**
 * Server part of `npm run bench`: this checkout and a baseline commit (see baselineRef) run side by side on the same bench database, and each is measured in turn, in alternating
 * rounds, so both see the same machine:
 * - /api/health latency idle, while 50 clients post /api/calc as fast as they can, and while design sheets render,
 *   probed from a child process (healthProbe.ts) so that this process's busy event loop is not in the figure;
 * - /api/calc throughput (full answers, the same request for both) and, for this checkout, with `sections`;
 * - what the machine allows: CPU per full answer of the server, MariaDB and the load generator (all on the same cores),
 *   the throughput ceiling that gives, and the work of the answer itself (engine and encoding, timed in this process).
 * Both apps get an unmeasured warm-up burst first.
 * The baseline runs this checkout's engine (BASELINE_OVERLAY is copied over its own), so both servers compute the same
 * answer and the ratio measures the server alone; the bench checks that both full answers are the same and says so.
 */

/**
 * Pure modules copied from this checkout over the baseline's: the engine (its validation and its result) and the
 * shared contracts and words that import it. The baseline's server imports only engine functions that still exist
 * (parseDesign, evaluateValidDesign, compareMechanisms, sweep …); should one disappear, its server fails to start
 * and the bench says so.
 */
export const BASELINE_OVERLAY = ['src/engine', 'src/contracts', 'src/format'];

/**
 * The baseline commit: BENCH_BASELINE when set; else where this branch leaves main (so both run the same engine
 * and only the server differs); once the branch is merged (that point is HEAD itself), the baseline recorded in
 * results.json.
 */
export function baselineRef(): string {
  if (process.env.BENCH_BASELINE) return process.env.BENCH_BASELINE;
  const git = (...args: string[]) => spawnSync('git', args, { cwd: ROOT_DIR, encoding: 'utf8' }).stdout.trim();
  const head = git('rev-parse', 'HEAD');
  const base = git('merge-base', 'HEAD', 'main');
  if (base && base !== head) return base;
  const recorded = readRecorded()?.baseline;
  if (recorded) return recorded;
  throw new Error('no baseline: set BENCH_BASELINE to the commit to compare with');
}
const CLIENTS = Number(process.env.BENCH_CALC_CLIENTS ?? 50);
const LOAD_SECONDS = Number(process.env.BENCH_LOAD_SECONDS ?? 5);
const ROUNDS = Number(process.env.BENCH_SERVER_ROUNDS ?? 3);
const IDLE_PROBES = 1000;
const WARMUP_SECONDS = 3;
const REWARM_SECONDS = 10;
const WARMUP_MIN_SECONDS = 24;
const WARMUP_MAX_SECONDS = Number(process.env.BENCH_WARMUP_MAX_SECONDS ?? 60);
const SETTLE_MS = 1000;
const SHEETS = 4;

const design = JSON.parse(fs.readFileSync(path.join(ROOT_DIR, 'reference/examples/corexy-dispensing-stage.json'), 'utf8')) as Record<
  string,
  unknown
>;

/** CPU time a process has used so far, all its threads, user + system [ms] (Linux /proc). */
function cpuMs(pid: number | undefined): number {
  try {
    const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100; // utime, stime in clock ticks (USER_HZ = 100)
  } catch {
    return Number.NaN;
  }
}

/** The work of one full answer itself, warm, in this process: the engine, then JSON and UTF-8 encoding (medians) [ms]. */
function answerWork(): { engineMs: number; encodeMs: number } {
  const engineMs: number[] = [];
  const encodeMs: number[] = [];
  for (let i = 0; i < 250; i++) {
    const t0 = performance.now();
    const result = evaluateDesign(design);
    const t1 = performance.now();
    Buffer.from(JSON.stringify(result), 'utf8');
    const t2 = performance.now();
    // The first 50 warm the code up.
    if (i >= 50) {
      engineMs.push(t1 - t0);
      encodeMs.push(t2 - t1);
    }
  }
  return { engineMs: median(engineMs), encodeMs: median(encodeMs) };
}

interface Sample {
  /** Server CPU per completed /api/calc under load [ms]. */
  cpuPerCalc: number[];
  /** MariaDB's and the load generator's CPU per completed /api/calc [ms] (they share the machine with the server). */
  dbCpuPerCalc: number[];
  loadCpuPerCalc: number[];
  idle: number[];
  underCalc: number[];
  underSheets: number[];
  calcPerS: number[];
  calcErrors: number;
  bytes: number;
}

/**
 * A bench helper in a child process of its own (a script next to this one, run with tsx): one command at a time,
 * answered by the child's next message; the child exiting rejects the command waiting.
 */
class BenchChild<Answer> {
  readonly child: ChildProcess;
  /** The command waiting for its answer. */
  private waiting: { resolve: (answer: Answer) => void; reject: (err: Error) => void } | null = null;

  constructor(script: string, args: string[], label: string) {
    this.child = fork(path.join(import.meta.dirname, script), args, { execArgv: ['--import', 'tsx'], stdio: 'inherit' });
    const settle = (how: (w: NonNullable<BenchChild<Answer>['waiting']>) => void) => {
      const w = this.waiting;
      this.waiting = null;
      if (w) how(w);
    };
    this.child.on('message', (answer: Answer) => settle((w) => w.resolve(answer)));
    this.child.on('exit', (code) => settle((w) => w.reject(new Error(`${label} exited (${code})`))));
  }

  ask(command: object): Promise<Answer> {
    return new Promise((resolve, reject) => {
      this.waiting = { resolve, reject };
      this.child.send(command);
    });
  }

  close(): void {
    this.child.disconnect();
  }
}

/**
 * /api/health probes from a child process (healthProbe.ts): its own event loop, so the latencies are the server's,
 * not delays of this process's event loop while it reads the load's answers.
 */
class HealthProber {
  private readonly helper: BenchChild<{ latencies: number[] }>;

  constructor(url: string) {
    this.helper = new BenchChild('healthProbe.ts', [url], 'health prober');
  }

  /** `n` probes in a row [ms]. */
  async count(n: number): Promise<number[]> {
    return (await this.helper.ask({ cmd: 'count', n })).latencies;
  }

  /** Probes every few ms until `until` settles. */
  async during<T>(until: Promise<T>): Promise<{ latencies: number[]; value: T }> {
    const probes = this.helper.ask({ cmd: 'start', gapMs: 5 });
    // Rethrown by the await below; without a handler now, a failure would end the bench at once (unhandled
    // rejection) and leave the app servers running.
    const finished = until.finally(() => this.helper.child.send({ cmd: 'stop' }));
    finished.catch(() => undefined);
    const { latencies } = await probes;
    return { latencies, value: await finished };
  }

  close(): void {
    this.helper.close();
  }
}

/** What one load run did: 200 answers, other answers and failures, the last answer's size [B], the loader's CPU [ms]. */
interface LoadRun {
  done: number;
  errors: number;
  bytes: number;
  cpuMs: number;
}

/**
 * The /api/calc load from a child process (calcLoad.ts): a lean process of its own, so that its CPU per answer is
 * that of the load alone (not of this process's heap, which holds the engine and the bench's bookkeeping), and
 * measured apart from the server's and MariaDB's.
 */
class CalcLoader {
  private readonly helper = new BenchChild<LoadRun>('calcLoad.ts', [], 'load generator');

  constructor(private readonly client: Client) {}

  /** `clients` loops posting `body` to /api/calc for `seconds`. */
  run(body: unknown, clients: number, seconds: number): Promise<LoadRun> {
    return this.helper.ask({ url: this.client.base, cookie: this.client.cookie, body: JSON.stringify(body), clients, seconds });
  }

  close(): void {
    this.helper.close();
  }
}

/** JSON with object keys sorted, so two answers that differ only in key order compare equal. */
function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)))
      : v,
  );
}

/** One full /api/calc answer of an app: its length in bytes and the SHA-256 of its canonical JSON. */
async function fullAnswer(app: AppProcess): Promise<{ bytes: number; sha256: string; body: string }> {
  const client = new Client(app.url);
  await client.signIn('designer@example.test');
  const r = await client.request('POST', '/api/calc', { design });
  client.close();
  if (r.status !== 200) throw new Error(`${app.label}: /api/calc answered ${r.status}: ${r.body.slice(0, 200)}`);
  const canonical = canonicalJson(JSON.parse(r.body));
  return { bytes: Buffer.byteLength(r.body), sha256: createHash('sha256').update(canonical).digest('hex'), body: r.body };
}

/** Creates, submits and approves `count` designs (each approval renders two PDF sheets). */
async function approveSheets(designer: Client, reviewer: Client, count: number, tag: string): Promise<number> {
  let approved = 0;
  for (let i = 0; i < count; i++) {
    const created = await designer.request('POST', '/api/designs', { template: 'corexy', name: `Bench sheet ${tag} ${Date.now()} ${i}` });
    const id = (JSON.parse(created.body) as { id: number }).id;
    const submitted = await designer.request('POST', `/api/designs/${id}/submit`, {});
    const revision = JSON.parse(submitted.body) as { id: number };
    const res = await reviewer.request('POST', `/api/revisions/${revision.id}/approve`, { comment: 'bench' });
    if (res.status === 200) approved++;
    else throw new Error(`approval failed (${res.status}): ${res.body.slice(0, 200)}`);
  }
  return approved;
}

async function measure(app: AppProcess, sample: Sample, withSheets: boolean, dbPid: number): Promise<void> {
  const probe = new HealthProber(app.url);
  const load = new Client(app.url);
  await load.signIn('designer@example.test');
  const loader = new CalcLoader(load);
  // Idle means idle: the previous phase (the other server's load, or the warm-up) has a second to settle first
  // (its last garbage collections, MariaDB's writes).
  await sleep(SETTLE_MS);
  sample.idle.push(...(await probe.count(IDLE_PROBES)));
  // Idle, a server sheds some of its warm state (half a minute idle costs it a fifth of its throughput, regained
  // over some ten seconds of load); the round measures it warm, as it runs under a steady load, so an unmeasured
  // burst comes first (the same for both apps).
  await loader.run({ design }, CLIENTS, REWARM_SECONDS);
  const cpuBefore = cpuMs(app.child.pid);
  const dbBefore = cpuMs(dbPid);
  const { latencies, value } = await probe.during(loader.run({ design }, CLIENTS, LOAD_SECONDS));
  const per = (ms: number) => ms / Math.max(1, value.done);
  sample.cpuPerCalc.push(per(cpuMs(app.child.pid) - cpuBefore));
  sample.dbCpuPerCalc.push(per(cpuMs(dbPid) - dbBefore));
  sample.loadCpuPerCalc.push(per(value.cpuMs));
  sample.underCalc.push(...latencies);
  sample.calcPerS.push(value.done / LOAD_SECONDS);
  sample.calcErrors += value.errors;
  sample.bytes = value.bytes;
  if (withSheets) {
    const reviewer = new Client(app.url);
    await reviewer.signIn('reviewer@example.test');
    const sheets = await probe.during(approveSheets(load, reviewer, SHEETS, app.label));
    sample.underSheets.push(...sheets.latencies);
    reviewer.close();
  }
  probe.close();
  loader.close();
  load.close();
}

export async function benchServer(): Promise<Figure[]> {
  const env = await benchEnv();
  const ref = baselineRef();
  const baseline = baselineCheckout(
    ref,
    BASELINE_OVERLAY.filter((folder) => fs.existsSync(path.join(ROOT_DIR, folder))),
  );
  setRecordedBaseline(baseline.commit);
  say(`server: baseline ${ref} (${baseline.commit.slice(0, 10)}) checked out in ${baseline.dir}`);
  const apps: AppProcess[] = [];
  try {
    const current = await startApp({ cwd: ROOT_DIR, port: BENCH_PORTS.app, database: BENCH_DB, label: 'this checkout' });
    apps.push(current);
    const before = await startApp({ cwd: baseline.dir, port: BENCH_PORTS.app + 1, database: BENCH_DB, label: 'baseline' });
    apps.push(before);
    // Both answer the same request with the same engine: the same result, else the throughput ratio means nothing.
    const answerNow = await fullAnswer(current);
    const answerThen = await fullAnswer(before);
    const sameAnswer = answerNow.sha256 === answerThen.sha256;
    const sameAnswerNote =
      `full answers ${answerNow.bytes} B vs ${answerThen.bytes} B, ` +
      (answerNow.body === answerThen.body
        ? `byte for byte the same (SHA-256 ${answerNow.sha256.slice(0, 12)})`
        : sameAnswer
          ? `the same result in another key order (canonical SHA-256 ${answerNow.sha256.slice(0, 12)})`
          : `DIFFERENT results (canonical SHA-256 ${answerNow.sha256.slice(0, 12)} vs ${answerThen.sha256.slice(0, 12)})`);
    say(`server: ${sameAnswerNote}`);
    const samples = new Map<AppProcess, Sample>(
      apps.map((a) => [
        a,
        {
          cpuPerCalc: [],
          dbCpuPerCalc: [],
          loadCpuPerCalc: [],
          idle: [],
          underCalc: [],
          underSheets: [],
          calcPerS: [],
          calcErrors: 0,
          bytes: 0,
        },
      ]),
    );
    // Warm-up: the same load on each app, unmeasured, until its throughput settles: a server keeps getting faster
    // for tens of seconds under load (optimised code in every engine thread, the heap growing to fit the load), and
    // a round on a half-warm server measures its start-up instead.
    for (const app of apps) {
      const warm = new Client(app.url);
      await warm.signIn('designer@example.test');
      const loader = new CalcLoader(warm);
      const rates: number[] = [];
      const started = performance.now();
      for (;;) {
        rates.push((await loader.run({ design }, CLIENTS, WARMUP_SECONDS)).done / WARMUP_SECONDS);
        const [a, b, c] = rates.slice(-3);
        const elapsed = (performance.now() - started) / 1000;
        const settled = elapsed >= WARMUP_MIN_SECONDS && Math.max(a, b, c) <= 1.05 * Math.min(a, b, c);
        if (settled || elapsed > WARMUP_MAX_SECONDS) break;
      }
      say(
        `server: ${app.label} warmed up in ${((performance.now() - started) / 1000).toFixed(0)} s (${rates.map((r) => r.toFixed(0)).join(', ')} req/s)`,
      );
      loader.close();
      warm.close();
    }
    for (let round = 0; round < ROUNDS; round++) {
      const order = round % 2 === 0 ? [current, before] : [before, current];
      for (const app of order) {
        say(`server: round ${round + 1}/${ROUNDS}, ${app.label}`);
        // Sheets only for this checkout: the baseline's sheet renderer reads the result shape of its own engine,
        // not of the overlaid one (an approval there fails).
        await measure(app, samples.get(app)!, round === ROUNDS - 1 && app === current, env.db.pid);
      }
    }
    // The leaner answer the Design desk's server calls can ask for.
    const lean = new Client(current.url);
    await lean.signIn('designer@example.test');
    const leanLoader = new CalcLoader(lean);
    const leanRun = await leanLoader.run({ design, sections: ['drive', 'envelope', 'checks'] }, CLIENTS, LOAD_SECONDS);
    leanLoader.close();
    lean.close();

    const now = samples.get(current)!;
    const then = samples.get(before)!;
    const p99 = (xs: number[]) => percentile(xs, 99);
    const idleNow = p99(now.idle);
    const idleThen = p99(then.idle);
    const tputNow = median(now.calcPerS);
    const tputThen = median(then.calcPerS);
    const cores = os.availableParallelism();
    const ceiling = (cores * 1000) / (median(now.cpuPerCalc) + median(now.dbCpuPerCalc) + median(now.loadCpuPerCalc));
    const ownWork = answerWork();
    return [
      info(
        'server.health.idle.p99',
        '/api/health p99, idle',
        idleNow,
        'ms',
        'lower',
        `baseline ${idleThen.toFixed(1)} ms; medians ${median(now.idle).toFixed(1)} / ${median(then.idle).toFixed(1)} ms`,
      ),
      atMost(
        'server.health.calc.ratio',
        `/api/health p99 under ${CLIENTS} concurrent /api/calc ÷ idle`,
        p99(now.underCalc) / idleNow,
        '×',
        3,
        `${p99(now.underCalc).toFixed(1)} ms under load (${now.underCalc.length} probes); baseline ${p99(then.underCalc).toFixed(1)} ms = ${(p99(then.underCalc) / idleThen).toFixed(1)}× its idle`,
      ),
      atMost(
        'server.health.sheets.ratio',
        '/api/health p99 while sheets render ÷ idle',
        p99(now.underSheets) / idleNow,
        '×',
        3,
        `${p99(now.underSheets).toFixed(1)} ms during ${SHEETS} approvals (not measured on the baseline: its sheet renderer cannot read this engine's result)`,
      ),
      atLeast(
        'server.calc.throughput.ratio',
        '/api/calc throughput ÷ baseline (same run)',
        tputNow / tputThen,
        '×',
        2,
        `${tputNow.toFixed(0)} vs ${tputThen.toFixed(0)} req/s, ${CLIENTS} clients, baseline ${baseline.commit.slice(0, 10)} with this checkout's engine; ${sameAnswerNote}; errors ${now.calcErrors}/${then.calcErrors}`,
      ),
      info('server.calc.throughput', '/api/calc throughput, full answer', tputNow, 'req/s', 'higher'),
      info(
        'server.calc.cpu.ratio',
        'server CPU per /api/calc, baseline ÷ this (all threads)',
        median(then.cpuPerCalc) / median(now.cpuPerCalc),
        '×',
        'higher',
        `${median(now.cpuPerCalc).toFixed(2)} ms vs ${median(then.cpuPerCalc).toFixed(2)} ms of CPU per request (user + system, /proc)`,
      ),
      info(
        'server.calc.ceiling',
        'full-answer throughput the cores allow at this CPU per request',
        ceiling,
        'req/s',
        'higher',
        `${cores} cores ÷ (server ${median(now.cpuPerCalc).toFixed(2)} + MariaDB ${median(now.dbCpuPerCalc).toFixed(2)} + load generator ` +
          `${median(now.loadCpuPerCalc).toFixed(2)} ms per request); 2× the baseline (${(2 * tputThen).toFixed(0)} req/s) would need ` +
          `≤ ${((cores * 1000) / (2 * tputThen)).toFixed(2)} ms in all, while computing and encoding the answer alone takes ` +
          `${ownWork.engineMs.toFixed(2)} + ${ownWork.encodeMs.toFixed(2)} ms (engine, JSON + UTF-8; measured in this process, the same work the baseline does)`,
      ),
      info(
        'server.calc.sections.throughput',
        '/api/calc throughput, sections drive+envelope+checks',
        leanRun.done / LOAD_SECONDS,
        'req/s',
        'higher',
        `${(leanRun.bytes / 1000).toFixed(1)} kB per answer`,
      ),
    ];
  } finally {
    for (const app of apps) await app.stop();
    baseline.remove();
  }
}
