import http from 'node:http';

/**
 * The /api/calc load generator of the server bench, run as a child process (`CalcLoader` in server.ts forks it).
 * It imports nothing but node:http, so its heap stays small and its CPU per answer is close to what a client on
 * another machine would take from this one; its CPU is measured on its own (process.cpuUsage, all its threads).
 *
 * Message from the parent: `{ url, cookie, body, clients, seconds }` (body: the request, JSON text) — `clients`
 * keep-alive connections each post the body and read the answer (counting its bytes, not decoding them) until
 * `seconds` have passed. Answers `{ done, errors, bytes, cpuMs }`: 200 answers, other answers and failures, the
 * last answer's size [B], and this process's CPU during the run [ms].
 */

interface LoadCommand {
  url: string;
  cookie: string;
  body: string;
  clients: number;
  seconds: number;
}

const agent = new http.Agent({ keepAlive: true, maxSockets: 1024 });

function post(url: string, cookie: string, body: Buffer): Promise<{ status: number; bytes: number }> {
  return new Promise((resolve) => {
    const req = http.request(
      url,
      { method: 'POST', agent, headers: { 'Content-Type': 'application/json', 'Content-Length': body.length, Cookie: cookie } },
      (res) => {
        let bytes = 0;
        res.on('data', (chunk: Buffer) => (bytes += chunk.length));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, bytes }));
        res.on('error', () => resolve({ status: 0, bytes: 0 }));
      },
    );
    req.on('error', () => resolve({ status: 0, bytes: 0 }));
    req.end(body);
  });
}

async function run(command: LoadCommand): Promise<void> {
  const body = Buffer.from(command.body);
  const url = `${command.url}/api/calc`;
  const cpu0 = process.cpuUsage();
  const end = performance.now() + command.seconds * 1000;
  let done = 0;
  let errors = 0;
  let bytes = 0;
  await Promise.all(
    Array.from({ length: command.clients }, async () => {
      while (performance.now() < end) {
        const r = await post(url, command.cookie, body);
        if (r.status === 200) {
          done++;
          bytes = r.bytes;
        } else errors++;
      }
    }),
  );
  const cpu = process.cpuUsage(cpu0);
  process.send?.({ done, errors, bytes, cpuMs: (cpu.user + cpu.system) / 1000 });
}

process.on('message', (command: LoadCommand) => void run(command));
process.on('disconnect', () => {
  agent.destroy();
  process.exit(0);
});
