/// <reference lib="webworker" />
import { sweepPoint, type DesignResult, type SweepPoint } from '@/engine';
import { compareRows, evaluateOutcome, sweepBase, warmEngine } from './engineTasks';
import type { EngineRequest, EngineResponse } from './engineProtocol';
import { packResult } from './resultParts';

/**
 * The engine off the main thread, so that typing never waits for it. An evaluation answers with the result
 * minus its large parts, plus the parts the visible tab needs packed into one Float64Array that is transferred
 * (moved, not copied); the last full result stays here so a tab opened later can fetch its parts without a new
 * evaluation. Sweeps yield between points so a cancel message is read before the next point.
 */
const scope = self as unknown as DedicatedWorkerGlobalScope;
const cancelled = new Set<number>();
/** The last evaluation's full result, for `parts` requests. */
let last: { id: number; result: DesignResult } | null = null;

function reply(message: EngineResponse, transfer: Transferable[] = []): void {
  scope.postMessage(message, transfer);
}

const nextTurn = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

scope.onmessage = async (event: MessageEvent<EngineRequest>) => {
  const msg = event.data;
  try {
    if (msg.type === 'cancel') {
      cancelled.add(msg.id);
      return;
    }
    if (msg.type === 'warm') {
      warmEngine();
      reply({ type: 'warm', id: msg.id });
      return;
    }
    if (msg.type === 'evaluate') {
      const started = performance.now();
      const outcome = evaluateOutcome(msg.design, { validated: msg.validated });
      const computeMs = performance.now() - started;
      if (!outcome.ok || !msg.parts) {
        reply({ type: 'evaluate', id: msg.id, outcome, computeMs });
        return;
      }
      last = { id: msg.id, result: outcome.result };
      const { light, packed } = packResult(outcome.result, msg.parts);
      reply({ type: 'evaluate', id: msg.id, outcome: { ok: true, result: light }, packed, computeMs }, [packed.values.buffer]);
      return;
    }
    if (msg.type === 'parts') {
      if (last?.id !== msg.evaluationId) {
        reply({ type: 'parts', id: msg.id, packed: null });
        return;
      }
      const { packed } = packResult(last.result, msg.parts);
      reply({ type: 'parts', id: msg.id, packed }, [packed.values.buffer]);
      return;
    }
    if (msg.type === 'compare') {
      reply({ type: 'compare', id: msg.id, rows: compareRows(msg.design) });
      return;
    }
    if (msg.type === 'sweep') {
      const base = sweepBase(msg.design);
      const points: SweepPoint[] = [];
      for (let i = 0; i < msg.spec.values.length; i++) {
        await nextTurn();
        if (cancelled.has(msg.id)) {
          cancelled.delete(msg.id);
          reply({ type: 'cancelled', id: msg.id });
          return;
        }
        const point = sweepPoint(base, msg.spec.path, msg.spec.values[i]);
        points.push(point);
        reply({ type: 'progress', id: msg.id, done: i + 1, total: msg.spec.values.length, point });
      }
      reply({ type: 'sweep', id: msg.id, points });
    }
  } catch (err) {
    reply({ type: 'error', id: msg.id, message: err instanceof Error ? err.message : String(err) });
  }
};
