// Calculation CLI: `npm run calc -- design.json` prints the engine's result for a design file as JSON;
// `--job points.csv` times that job on the design (x, y and an optional dwell; docs/models/job-timing.md).
// Exit codes: 0 result printed; 2 the user's input is at fault (no file given, unreadable file, not JSON,
// invalid design — each field path on stderr); 1 only for a fault of the engine itself.
import { readFileSync } from 'node:fs';
import { EngineInputError, evaluateDesign } from '@/engine';
import { CsvError, parseJobCsv } from '../server/uploads';

const USAGE = 'usage: npm run calc -- <design.json> [--job <points.csv>] [--compact]';

// A reader that stops early (`| head`) closes the pipe; that is not an error of the calculation.
process.stdout.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EPIPE') process.exit(0);
  throw err;
});

function fail(message: string): never {
  process.stderr.write(`${message}\n`);
  process.exit(2);
}

/** The job points of a CSV file (exit 2 naming line and column when it cannot be used). */
function readJob(file: string): { xMm: number; yMm: number; dwellS: number }[] {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    fail(`cannot read ${file}: ${(err as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (err as Error).message}`);
  }
  try {
    return parseJobCsv(text).points;
  } catch (err) {
    if (err instanceof CsvError) {
      const lines = err.details.map(
        (d) => `  ${[d.line !== null ? `line ${d.line}` : null, d.column].filter(Boolean).join(', ') || '(file)'}: ${d.message}`,
      );
      fail(`${file} is not a usable job file:\n${lines.join('\n')}`);
    }
    throw err;
  }
}

function main(argv: string[]): void {
  const jobAt = argv.indexOf('--job');
  const jobFile = jobAt >= 0 ? argv[jobAt + 1] : undefined;
  if (jobAt >= 0 && (!jobFile || jobFile.startsWith('--'))) fail(`--job needs a CSV file\n${USAGE}`);
  const args = argv.filter((a, i) => !a.startsWith('--') && !(jobAt >= 0 && i === jobAt + 1));
  const compact = argv.includes('--compact');
  if (argv.includes('--help') || argv.includes('-h')) {
    process.stdout.write(`${USAGE}\n`);
    return;
  }
  if (args.length !== 1) fail(args.length === 0 ? `no design file given\n${USAGE}` : `give exactly one design file\n${USAGE}`);
  const file = args[0];
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    fail(`cannot read ${file}: ${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : (err as Error).message}`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    fail(`${file} is not valid JSON: ${(err as Error).message}`);
  }
  if (jobFile) {
    if (json === null || typeof json !== 'object' || Array.isArray(json)) fail(`${file} is not a design document`);
    json = { ...(json as Record<string, unknown>), job: { points: readJob(jobFile) } };
  }
  try {
    const result = evaluateDesign(json);
    process.stdout.write(`${JSON.stringify(result, null, compact ? 0 : 2)}\n`);
  } catch (err) {
    if (err instanceof EngineInputError) {
      const lines = err.issues.map((i) => `  ${i.path || '(document)'}: ${i.message}`);
      fail(`${file} is not a valid design:\n${lines.join('\n')}`);
    }
    throw err;
  }
}

try {
  main(process.argv.slice(2));
} catch (err) {
  process.stderr.write(`internal error of the calculation engine: ${(err as Error).stack ?? String(err)}\n`);
  process.exit(1);
}
