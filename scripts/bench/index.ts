/**
 * `npm run bench [-- part…] [--record]`: measures what people feel and prints one table (figure, target,
 * measured, ratio, ok/warn). Parts: engine, sheet, bundle, server, editor, list (all by default). A figure more than 2×
 * worse than the one recorded in scripts/bench/results.json prints a warning; `--record` writes this run there.
 * Benchmarks never fail: the exit code is 0 unless the benchmark itself broke.
 */
import os from 'node:os';
import { formatTable, readRecorded, record, regressions, say, type Figure } from './lib';

const PARTS = ['engine', 'sheet', 'bundle', 'server', 'editor', 'list'] as const;
type Part = (typeof PARTS)[number];

async function runPart(part: Part): Promise<Figure[]> {
  switch (part) {
    case 'engine':
      return (await import('./engine')).benchEngine();
    case 'sheet':
      return (await import('./sheet')).benchSheet();
    case 'bundle':
      return (await import('./bundle')).benchBundle();
    case 'server':
      return (await import('./server')).benchServer();
    case 'editor':
      return (await import('./editor')).benchEditor();
    case 'list':
      return (await import('./list')).benchList();
  }
}

/** The machine in one line, for the README and results.json. */
export function machineLine(): string {
  const cpus = os.cpus();
  return `${cpus[0]?.model ?? 'unknown CPU'}, ${os.availableParallelism()} cores, ${Math.round(os.totalmem() / 2 ** 30)} GiB, Node ${process.version}, load ${os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join('/')}`;
}

async function main(): Promise<number> {
  const args = process.argv.slice(2);
  const wanted = args.filter((a) => !a.startsWith('--'));
  const unknown = wanted.filter((p) => !PARTS.includes(p as Part));
  if (unknown.length) {
    process.stderr.write(`unknown part(s): ${unknown.join(', ')}; parts are ${PARTS.join(', ')}\n`);
    return 2;
  }
  const parts = (wanted.length ? wanted : PARTS) as Part[];
  const figures: Figure[] = [];
  const broken: string[] = [];
  for (const part of parts) {
    const started = Date.now();
    try {
      figures.push(...(await runPart(part)));
      say(`${part}: done in ${((Date.now() - started) / 1000).toFixed(0)} s`);
    } catch (err) {
      broken.push(`${part}: ${(err as Error).stack ?? err}`);
      say(`${part}: FAILED — ${(err as Error).message}`);
    }
  }
  const { closeBenchEnv } = await import('./env');
  await closeBenchEnv();
  const machine = machineLine();
  process.stdout.write(`\nGantrywright benchmarks — ${machine}\n\n${formatTable(figures)}\n\n`);
  for (const f of figures) if (f.note) process.stdout.write(`  ${f.label}: ${f.note}\n`);
  const recorded = readRecorded();
  const worse = regressions(figures, recorded);
  if (worse.length) {
    process.stdout.write(`\nWARNING: more than 2× worse than recorded (${recorded!.recordedAt}, ${recorded!.machine}):\n`);
    for (const line of worse) process.stdout.write(`  ! ${line}\n`);
  } else if (recorded) process.stdout.write(`\nNo figure is more than 2× worse than the recorded run (${recorded.recordedAt}).\n`);
  if (args.includes('--record')) {
    record(figures, machine);
    process.stdout.write('Recorded this run in scripts/bench/results.json.\n');
  }
  if (broken.length) {
    process.stdout.write(`\n${broken.length} part(s) could not run:\n${broken.map((b) => `  ${b}`).join('\n')}\n`);
    return 1;
  }
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    process.stderr.write(`${(err as Error).stack ?? err}\n`);
    process.exit(1);
  },
);
