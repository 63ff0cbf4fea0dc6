import http from 'node:http';

/**
 * The /api/health prober of the server bench, run as a child process (`HealthProber` in server.ts forks it). It has
 * an event loop of its own, so what it measures is the server's latency, not the time a probe's answer waits in a
 * load generator that is busy reading fifty clients' answers. One keep-alive connection, one probe at a time.
 *
 * Messages from the parent: `{ cmd: 'count', n }` probes n times in a row; `{ cmd: 'start', gapMs }` probes with a
 * pause of gapMs between probes until `{ cmd: 'stop' }`. Each answers `{ latencies }` [ms] (200 answers only).
 */

type Command = { cmd: 'count'; n: number } | { cmd: 'start'; gapMs: number } | { cmd: 'stop' };

const base = process.argv[2];
const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
let running = false;

function probe(): Promise<number | null> {
  const started = performance.now();
  return new Promise((resolve) => {
    const req = http.get(`${base}/api/health`, { agent }, (res) => {
      res.resume();
      res.on('end', () => resolve(res.statusCode === 200 ? performance.now() - started : null));
      res.on('error', () => resolve(null));
    });
    req.on('error', () => resolve(null));
  });
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

async function run(command: Command): Promise<void> {
  const latencies: number[] = [];
  const keep = (ms: number | null) => {
    if (ms !== null) latencies.push(ms);
  };
  if (command.cmd === 'count') {
    for (let i = 0; i < command.n; i++) keep(await probe());
  } else if (command.cmd === 'start') {
    running = true;
    while (running) {
      keep(await probe());
      await sleep(command.gapMs);
    }
  }
  process.send?.({ latencies });
}

process.on('message', (command: Command) => {
  if (command.cmd === 'stop') running = false;
  else void run(command);
});
process.on('disconnect', () => {
  agent.destroy();
  process.exit(0);
});
