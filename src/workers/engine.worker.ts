/// <reference lib="webworker" />
import { compareOutcomes, evaluateOutcome, sweepPoint } from './engineTasks';
import type { EngineRequest, EngineResponse } from './engineProtocol';

/**
 * The engine off the main thread: one evaluation takes 100–200 ms on a modest machine, which would make
 * typing stutter. Sweeps yield between points so a cancel message is read before the next point.
 */
const scope = self as unknown as DedicatedWorkerGlobalScope;
const cancelled = new Set<number>();

function reply(message: EngineResponse): void {
  scope.postMessage(message);
}

const nextTurn = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

scope.onmessage = async (event: MessageEvent<EngineRequest>) => {
  const msg = event.data;
  try {
    if (msg.type === 'cancel') {
      cancelled.add(msg.id);
      return;
    }
    if (msg.type === 'evaluate') {
      reply({ type: 'evaluate', id: msg.id, outcome: evaluateOutcome(msg.design) });
      return;
    }
    if (msg.type === 'compare') {
      reply({ type: 'compare', id: msg.id, columns: compareOutcomes(msg.design) });
      return;
    }
    if (msg.type === 'sweep') {
      const points = [];
      for (let i = 0; i < msg.spec.values.length; i++) {
        await nextTurn();
        if (cancelled.has(msg.id)) {
          cancelled.delete(msg.id);
          reply({ type: 'cancelled', id: msg.id });
          return;
        }
        const point = sweepPoint(msg.design, msg.spec.path, msg.spec.values[i]);
        points.push(point);
        reply({ type: 'progress', id: msg.id, done: i + 1, total: msg.spec.values.length, point });
      }
      reply({ type: 'sweep', id: msg.id, points });
    }
  } catch (err) {
    reply({ type: 'error', id: msg.id, message: err instanceof Error ? err.message : String(err) });
  }
};
