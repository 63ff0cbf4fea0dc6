import { compareRows, evaluateOutcome, sweepBase, type Outcome, type SweepSpec } from './engineTasks';
import type { EngineRequest, EngineResponse } from './engineProtocol';
import { RESULT_PARTS, unpackResult, type PackedParts, type ResultPart } from './resultParts';
import { warmEngine } from './engineTasks';
import { sweepPoint, type ComparisonRow, type DesignResult, type SweepPoint } from '@/engine';

/** Progress callback of a sweep. */
export type SweepProgress = (done: number, total: number, point: SweepPoint) => void;

/** Options of {@link EngineRunner.evaluate}. */
export interface EvaluateOptions {
  /** The design already passed the shared schema: the engine runs on it without parsing it again. */
  validated?: boolean;
  /** Large result parts wanted now (the visible tab's); absent = all of them. */
  parts?: ResultPart[];
}

/**
 * An evaluation's outcome; a result may lack some large parts (`missing`), fetched later with completeParts.
 * `computeMs` is the engine's own time, without waiting for the worker (busy with warming up or an earlier run).
 */
export type Evaluation = Outcome & { missing?: ResultPart[]; computeMs?: number };

/** Runs engine work in the worker, or on the main thread where workers do not exist. */
export interface EngineRunner {
  /** True when the work runs in a Web Worker. */
  readonly usesWorker: boolean;
  /** Evaluates one design. */
  evaluate(design: Record<string, unknown>, options?: EvaluateOptions): Promise<Evaluation>;
  /**
   * The same result with the given large parts filled in, from the worker's copy of the last evaluation.
   * @returns the completed result, or null when a newer evaluation replaced it (evaluate again)
   */
  completeParts?(result: DesignResult, parts: ResultPart[]): Promise<DesignResult | null>;
  /** Loads and compiles the engine ahead of the first evaluation. */
  warm?(): Promise<void>;
  /** Evaluates the design under every mechanism. */
  compare(design: Record<string, unknown>): Promise<ComparisonRow[]>;
  /** Evaluates the design at each value of one input, reporting progress; rejects with AbortError when aborted. */
  sweep(design: Record<string, unknown>, spec: SweepSpec, onProgress?: SweepProgress, signal?: AbortSignal): Promise<SweepPoint[]>;
}

interface Pending {
  resolve: (value: never) => void;
  reject: (err: unknown) => void;
  onProgress?: SweepProgress;
  request: EngineRequest;
}

const abortError = (): DOMException => new DOMException('The sweep was stopped.', 'AbortError');
const nextTurn = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

/** Main-thread runner (tests, or a browser that refused the worker). */
function inlineRunner(): EngineRunner {
  return {
    usesWorker: false,
    async evaluate(design, options) {
      await nextTurn();
      const started = performance.now();
      const outcome = evaluateOutcome(design, { validated: options?.validated });
      return { ...outcome, computeMs: performance.now() - started };
    },
    async completeParts(result) {
      return result; // main-thread results are always whole
    },
    async warm() {
      await nextTurn();
      warmEngine(1);
    },
    async compare(design) {
      await nextTurn();
      return compareRows(design);
    },
    async sweep(design, spec, onProgress, signal) {
      const base = sweepBase(design);
      const points: SweepPoint[] = [];
      for (let i = 0; i < spec.values.length; i++) {
        await nextTurn();
        if (signal?.aborted) throw abortError();
        const point = sweepPoint(base, spec.path, spec.values[i]);
        points.push(point);
        onProgress?.(i + 1, spec.values.length, point);
      }
      return points;
    },
  };
}

/** Runner backed by the engine worker; falls back to the main thread if the worker fails to start. */
function workerRunner(worker: Worker): EngineRunner {
  const pending = new Map<number, Pending>();
  let nextId = 1;
  let fallback: EngineRunner | null = null;

  /** What each worker result still lacks, and which evaluation it came from. */
  const partsOf = new WeakMap<DesignResult, { evaluationId: number; missing: ResultPart[] }>();

  function withParts(light: DesignResult, packed: PackedParts | undefined, evaluationId: number): Evaluation {
    if (!packed) return { ok: true, result: light, missing: [] };
    const result = unpackResult(light, packed);
    const missing = RESULT_PARTS.filter((p) => !packed.parts.includes(p));
    partsOf.set(result, { evaluationId, missing });
    return { ok: true, result, missing };
  }

  function replay(p: Pending): void {
    const inline = fallback!;
    const r = p.request;
    if (r.type === 'evaluate') inline.evaluate(r.design, { validated: r.validated }).then(p.resolve as never, p.reject);
    else if (r.type === 'parts') p.resolve(null as never);
    else if (r.type === 'warm') p.resolve(undefined as never);
    else if (r.type === 'compare') inline.compare(r.design).then(p.resolve as never, p.reject);
    else if (r.type === 'sweep') inline.sweep(r.design, r.spec, p.onProgress).then(p.resolve as never, p.reject);
  }

  worker.onmessage = (event: MessageEvent<EngineResponse>) => {
    const msg = event.data;
    const p = pending.get(msg.id);
    if (!p) return;
    switch (msg.type) {
      case 'progress':
        p.onProgress?.(msg.done, msg.total, msg.point);
        return;
      case 'evaluate':
        pending.delete(msg.id);
        (p.resolve as (v: Evaluation) => void)({
          ...(msg.outcome.ok ? withParts(msg.outcome.result, msg.packed, msg.id) : msg.outcome),
          computeMs: msg.computeMs,
        });
        return;
      case 'parts':
      case 'warm':
        pending.delete(msg.id);
        (p.resolve as (v: unknown) => void)(msg.type === 'parts' ? msg.packed : undefined);
        return;
      case 'compare':
        pending.delete(msg.id);
        (p.resolve as (v: ComparisonRow[]) => void)(msg.rows);
        return;
      case 'sweep':
        pending.delete(msg.id);
        (p.resolve as (v: SweepPoint[]) => void)(msg.points);
        return;
      case 'cancelled':
        pending.delete(msg.id);
        p.reject(abortError());
        return;
      case 'error':
        pending.delete(msg.id);
        p.reject(new Error(msg.message));
    }
  };
  worker.onerror = (event) => {
    // The worker script failed (e.g. blocked); finish the work on the main thread instead.
    event.preventDefault?.();
    worker.terminate();
    fallback = inlineRunner();
    for (const p of pending.values()) replay(p);
    pending.clear();
  };

  function send<T>(request: EngineRequest, onProgress?: SweepProgress): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      const p: Pending = { resolve: resolve as (v: never) => void, reject, onProgress, request };
      if (fallback) {
        replay(p);
        return;
      }
      pending.set(request.id, p);
      worker.postMessage(request);
    });
  }

  return {
    get usesWorker() {
      return fallback === null;
    },
    evaluate(design, options) {
      if (fallback) return fallback.evaluate(design, options);
      return send<Evaluation>({ type: 'evaluate', id: nextId++, design, validated: options?.validated, parts: options?.parts });
    },
    async completeParts(result, parts) {
      const info = partsOf.get(result);
      if (!info) return result;
      const need = info.missing.filter((p) => parts.includes(p));
      if (!need.length) return result;
      if (fallback) return null;
      const packed = await send<PackedParts | null>({ type: 'parts', id: nextId++, evaluationId: info.evaluationId, parts: need });
      if (!packed) return null;
      const merged = unpackResult(result, packed);
      partsOf.set(merged, { evaluationId: info.evaluationId, missing: info.missing.filter((p) => !need.includes(p)) });
      return merged;
    },
    warm() {
      if (fallback) return fallback.warm!();
      return send<void>({ type: 'warm', id: nextId++ });
    },
    compare(design) {
      if (fallback) return fallback.compare(design);
      return send<ComparisonRow[]>({ type: 'compare', id: nextId++, design });
    },
    sweep(design, spec, onProgress, signal) {
      if (fallback) return fallback.sweep(design, spec, onProgress, signal);
      const id = nextId++;
      if (signal?.aborted) return Promise.reject(abortError());
      signal?.addEventListener('abort', () => worker.postMessage({ type: 'cancel', id } satisfies EngineRequest), { once: true });
      return send<SweepPoint[]>({ type: 'sweep', id, design, spec }, onProgress);
    },
  };
}

let shared: EngineRunner | null = null;

/**
 * The page's engine runner (one worker for the whole page, started on first use).
 * @returns a runner: the Web Worker where available, else the main thread
 */
export function getEngineRunner(): EngineRunner {
  if (shared) return shared;
  if (typeof Worker === 'undefined') {
    shared = inlineRunner();
    return shared;
  }
  try {
    shared = workerRunner(new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module', name: 'engine' }));
  } catch {
    shared = inlineRunner();
  }
  return shared;
}
