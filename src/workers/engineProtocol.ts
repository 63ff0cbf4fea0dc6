import type { ComparisonRow, DesignResult, SweepPoint } from '@/engine';
import type { Outcome, SweepSpec } from './engineTasks';
import type { PackedParts, ResultPart } from './resultParts';

/** Messages the page sends to the engine worker. */
export type EngineRequest =
  | {
      type: 'evaluate';
      id: number;
      design: Record<string, unknown>;
      /** The design already passed the shared schema on the page: do not parse it again. */
      validated?: boolean;
      /** Large parts of the result to send (the visible tab's); absent = the whole result. */
      parts?: ResultPart[];
    }
  | { type: 'parts'; id: number; evaluationId: number; parts: ResultPart[] }
  | { type: 'warm'; id: number }
  | { type: 'compare'; id: number; design: Record<string, unknown> }
  | { type: 'sweep'; id: number; design: Record<string, unknown>; spec: SweepSpec }
  | { type: 'cancel'; id: number };

/** Messages the engine worker answers with. */
export type EngineResponse =
  /** `computeMs`: how long the engine itself took in the worker (not the wait for the worker or the copy back). */
  | { type: 'evaluate'; id: number; outcome: Outcome; packed?: PackedParts; computeMs?: number }
  | { type: 'parts'; id: number; packed: PackedParts | null }
  | { type: 'warm'; id: number }
  | { type: 'compare'; id: number; rows: ComparisonRow[] }
  | { type: 'progress'; id: number; done: number; total: number; point: SweepPoint }
  | { type: 'sweep'; id: number; points: SweepPoint[] }
  | { type: 'cancelled'; id: number }
  | { type: 'error'; id: number; message: string };

/** A result the worker sent without some of its large parts. */
export type PartialResult = { result: DesignResult; missing: ResultPart[] };
