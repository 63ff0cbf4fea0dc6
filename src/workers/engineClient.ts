import {
  compareOutcomes,
  evaluateOutcome,
  sweepPoint,
  type CompareColumn,
  type Outcome,
  type SweepPoint,
  type SweepSpec,
} from './engineTasks';
import type { EngineRequest, EngineResponse } from './engineProtocol';

/** Progress callback of a sweep. */
export type SweepProgress = (done: number, total: number, point: SweepPoint) => void;

/** Runs engine work in the worker, or on the main thread where workers do not exist. */
export interface EngineRunner {
  /** True when the work runs in a Web Worker. */
  readonly usesWorker: boolean;
  /** Evaluates one design. */
  evaluate(design: Record<string, unknown>): Promise<Outcome>;
  /** Evaluates the design under every mechanism. */
  compare(design: Record<string, unknown>): Promise<CompareColumn[]>;
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
    async evaluate(design) {
      await nextTurn();
      return evaluateOutcome(design);
    },
    async compare(design) {
      await nextTurn();
      return compareOutcomes(design);
    },
    async sweep(design, spec, onProgress, signal) {
      const points: SweepPoint[] = [];
      for (let i = 0; i < spec.values.length; i++) {
        await nextTurn();
        if (signal?.aborted) throw abortError();
        const point = sweepPoint(design, spec.path, spec.values[i]);
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

  function replay(p: Pending): void {
    const inline = fallback!;
    const r = p.request;
    if (r.type === 'evaluate') inline.evaluate(r.design).then(p.resolve as never, p.reject);
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
        (p.resolve as (v: Outcome) => void)(msg.outcome);
        return;
      case 'compare':
        pending.delete(msg.id);
        (p.resolve as (v: CompareColumn[]) => void)(msg.columns);
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
    evaluate(design) {
      if (fallback) return fallback.evaluate(design);
      return send<Outcome>({ type: 'evaluate', id: nextId++, design });
    },
    compare(design) {
      if (fallback) return fallback.compare(design);
      return send<CompareColumn[]>({ type: 'compare', id: nextId++, design });
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
