import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { ENGINE_VERSION, evaluateDesign } from '@/engine';
import { floorInputs, floorRun } from './engineFloor';
import { atMost, info, median, say, type Figure } from './lib';

/**
 * Engine part of `npm run bench`: evaluateDesign on the demo designs (reference/examples) with a 101-point
 * stiffness map, and the plain reference loop of engineFloor.ts, timed alternately in the same run so that both
 * see the same machine load. Figures: the engine's median, engine ÷ floor, and the median of the demo designs that
 * carry a job (timed moves through its points; target ≤ 15 ms for a 50-point job).
 */
const WARMUP = 10;
const ROUNDS = Number(process.env.BENCH_ENGINE_ROUNDS ?? 30);
const POINTS = 101;
const JOB_TARGET_MS = 15;

export async function benchEngine(): Promise<Figure[]> {
  const dir = join(import.meta.dirname, '..', '..', 'reference', 'examples');
  const designs = readdirSync(dir)
    .filter((f) => f.endsWith('.json'))
    .sort()
    .map((f) => ({ ...JSON.parse(readFileSync(join(dir, f), 'utf8')), map: { points: POINTS } }));
  if (!designs.length) throw new Error(`no demo designs in ${dir}`);
  say(`engine ${ENGINE_VERSION}: ${designs.length} demo designs, ${POINTS}-point map, ${ROUNDS} rounds after ${WARMUP} warm-up`);
  const floor = floorInputs();
  let sink = 0;
  for (let i = 0; i < WARMUP; i++) {
    for (const d of designs) evaluateDesign(d);
    sink += floorRun(floor, POINTS);
  }
  const engineMs: number[] = [];
  const jobMs: number[] = [];
  const floorMs: number[] = [];
  const jobPoints = Math.max(0, ...designs.map((d) => d.job?.points?.length ?? 0));
  for (let round = 0; round < ROUNDS; round++) {
    for (const d of designs) {
      const t0 = performance.now();
      evaluateDesign(d);
      const ms = performance.now() - t0;
      engineMs.push(ms);
      if (d.job?.points?.length) jobMs.push(ms);
      const t1 = performance.now();
      sink += floorRun(floor, POINTS);
      floorMs.push(performance.now() - t1);
    }
  }
  if (!Number.isFinite(sink)) say('engine: floor checksum is not finite');
  const e = median(engineMs);
  const f = median(floorMs);
  return [
    atMost(
      'engine.median',
      'engine, demo designs, 101-point map (median)',
      e,
      'ms',
      3,
      `${engineMs.length} runs; min ${Math.min(...engineMs).toFixed(2)} ms`,
    ),
    atMost('engine.ratio', 'engine ÷ plain reference loop (same run)', e / f, '×', 2, `reference loop median ${f.toFixed(2)} ms`),
    info('engine.floor', 'plain reference loop (median)', f, 'ms'),
    ...(jobMs.length
      ? [
          atMost(
            'engine.job',
            `engine, demo design with a ${jobPoints}-point job (median)`,
            median(jobMs),
            'ms',
            JOB_TARGET_MS,
            `${jobMs.length} runs; min ${Math.min(...jobMs).toFixed(2)} ms`,
          ),
        ]
      : []),
  ];
}
