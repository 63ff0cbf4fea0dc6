// Benchmark of evaluateDesign: the demo designs with a 101 × 101 stiffness map and 360 directions.
// Prints the median over ≥ 20 timed runs after a warm-up, per design and overall. Target: ≤ 10 ms median.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { ENGINE_VERSION, evaluateDesign } from '@/engine';

const WARMUP = 10;
const RUNS = Number(process.env.BENCH_RUNS ?? 40);
const TARGET_MS = 10;
const dir = join(import.meta.dirname, '..', 'reference', 'examples');

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

const files = readdirSync(dir)
  .filter((f) => f.endsWith('.json'))
  .sort();
if (files.length === 0) {
  process.stderr.write(`no demo designs in ${dir}\n`);
  process.exit(2);
}
const all: number[] = [];
const allCpu: number[] = [];
process.stdout.write(
  `engine ${ENGINE_VERSION}: evaluateDesign, 101 × 101 stiffness map, 360 directions, ${RUNS} runs after ${WARMUP} warm-up\n`,
);
for (const f of files) {
  const design = { ...JSON.parse(readFileSync(join(dir, f), 'utf8')), map: { points: 101 } };
  for (let i = 0; i < WARMUP; i++) evaluateDesign(design);
  const times: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < Math.max(20, RUNS); i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    evaluateDesign(design);
    times.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  all.push(...times);
  allCpu.push(...cpu);
  process.stdout.write(
    `  ${f.padEnd(34)} median ${median(times).toFixed(2)} ms  (min ${Math.min(...times).toFixed(2)} ms, CPU median ${median(cpu).toFixed(2)} ms)\n`,
  );
}
const m = median(all);
// Wall-clock time is the figure that counts; CPU time shows how much of it other processes on a busy machine took.
process.stdout.write(
  `overall median ${m.toFixed(2)} ms wall clock (CPU ${median(allCpu).toFixed(2)} ms) — target ≤ ${TARGET_MS} ms: ${m <= TARGET_MS ? 'met' : 'NOT met'}\n`,
);
