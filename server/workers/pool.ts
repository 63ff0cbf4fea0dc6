import path from 'node:path';
import { Piscina } from 'piscina';
import type { DesignInput } from '@/engine';
import { getConfig } from '../config';
import { AppError } from '../errors';
import type { RenderedSheet, SheetSource } from '../services/sheets.service';
import type { CalcTask, TaskFailure } from './tasks';

/**
 * The server's worker-thread pools (piscina). One event loop serves every request, so anything that keeps the CPU
 * busy for milliseconds — the engine, turning its result into JSON, rendering a PDF sheet — runs here instead, and
 * /api/health, sign-ins and lists keep answering while it runs. Two pools, so that a sheet being rendered (about a
 * second) never queues the engine's short tasks behind it.
 *
 * Threads load server/workers/entry.mjs, which registers tsx where the thread did not inherit it (tests).
 */

const ENTRY = path.join(import.meta.dirname, 'entry.mjs');

let enginePool: Piscina | null = null;
let pdfPool: Piscina | null = null;

/**
 * @param keep - threads that never end: the engine pool keeps all of them, so a burst of requests after a quiet
 *   minute never waits while a new thread loads TypeScript and the engine (hundreds of milliseconds of CPU, taken
 *   from the cores that are busy with that burst); the sheet pool keeps one
 */
function makePool(threads: number, name: string, keep: number): Piscina {
  return new Piscina({
    filename: ENTRY,
    minThreads: Math.min(keep, threads),
    maxThreads: threads,
    // Threads beyond `keep` end after a minute idle.
    idleTimeout: 60_000,
    // Queue without bound: each request waits its turn rather than failing (the HTTP layer limits concurrency).
    maxQueue: Infinity,
    // Each thread lowers its own scheduling priority (entry.mjs), so the event loop gets a core first.
    workerData: { pool: name, nice: getConfig().workers.nice },
  });
}

/** The engine pool (created on first use). */
export function getEnginePool(): Piscina {
  const threads = getConfig().workers.engineThreads;
  enginePool ??= makePool(threads, 'engine', threads);
  return enginePool;
}

/** The sheet-rendering pool (created on first use). */
export function getPdfPool(): Piscina {
  pdfPool ??= makePool(getConfig().workers.pdfThreads, 'pdf', 1);
  return pdfPool;
}

/** Starts the engine threads (each loads the engine as it starts), so the first requests do not pay for it. */
export async function warmPools(): Promise<void> {
  await getEnginePool().run(null, { name: 'ping' });
}

/** Stops both pools (server shutdown, end of tests); tasks still queued are rejected. */
export async function closePools(): Promise<void> {
  const pools = [enginePool, pdfPool].filter((p): p is Piscina => p !== null);
  enginePool = null;
  pdfPool = null;
  await Promise.all(pools.map((p) => p.close({ force: true })));
}

function isFailure(value: unknown): value is TaskFailure {
  return typeof value === 'object' && value !== null && 'failure' in value;
}

/** Turns a failure that crossed the thread boundary back into the AppError it was. */
function unwrap<T>(answer: { value: T } | TaskFailure): T {
  if (isFailure(answer)) {
    const f = answer.failure;
    throw new AppError(f.code, f.message, f.status, { details: f.details as never });
  }
  return answer.value;
}

/**
 * Runs the engine in the pool and returns the JSON answer as bytes (see tasks.ts `calc`).
 * @throws AppError 400 when the engine rejects the design (layout problems the schema cannot see)
 */
export async function calcJson(task: CalcTask): Promise<Buffer> {
  // The body moves to the worker; a small Buffer may share its memory with others and is copied first.
  const body =
    task.body && task.body.byteOffset === 0 && task.body.byteLength === task.body.buffer.byteLength
      ? task.body
      : task.body && new Uint8Array(task.body);
  const out = (await getEnginePool().run(
    { kind: task.kind, body },
    { name: 'calc', transferList: body ? [body.buffer as ArrayBuffer] : undefined },
  )) as Uint8Array | TaskFailure;
  if (isFailure(out)) unwrap(out);
  const bytes = out as Uint8Array;
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** freezeDesign (services/freezeRevision.ts) in the engine pool. */
export async function freezeInPool(storedInputs: unknown): Promise<ReturnType<typeof import('../services/freezeRevision').freezeDesign>> {
  return unwrap(await getEnginePool().run(storedInputs, { name: 'freeze' }));
}

/** computeStoredResults (services/designs.service.ts) in the engine pool. */
export async function storedResultsInPool(
  document: DesignInput,
  pathPrefix?: string,
): Promise<ReturnType<typeof import('../services/designs.service').computeStoredResults>> {
  return unwrap(await getEnginePool().run({ document, pathPrefix }, { name: 'storedResults' }));
}

/** Both paper sizes of a design sheet, rendered in the PDF pool. */
export async function renderSheetsInPool(source: SheetSource & { appUrl: string }): Promise<RenderedSheet> {
  const out = (await getPdfPool().run(source, { name: 'renderSheets' })) as {
    a4: Uint8Array;
    a4Sha256: string;
    letter: Uint8Array;
    letterSha256: string;
  };
  const buf = (u: Uint8Array) => Buffer.from(u.buffer, u.byteOffset, u.byteLength);
  return { a4: buf(out.a4), a4Sha256: out.a4Sha256, letter: buf(out.letter), letterSha256: out.letterSha256 };
}
