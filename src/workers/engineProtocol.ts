import type { CompareColumn, Outcome, SweepPoint, SweepSpec } from './engineTasks';

/** Messages the page sends to the engine worker. */
export type EngineRequest =
  | { type: 'evaluate'; id: number; design: Record<string, unknown> }
  | { type: 'compare'; id: number; design: Record<string, unknown> }
  | { type: 'sweep'; id: number; design: Record<string, unknown>; spec: SweepSpec }
  | { type: 'cancel'; id: number };

/** Messages the engine worker answers with. */
export type EngineResponse =
  | { type: 'evaluate'; id: number; outcome: Outcome }
  | { type: 'compare'; id: number; columns: CompareColumn[] }
  | { type: 'progress'; id: number; done: number; total: number; point: SweepPoint }
  | { type: 'sweep'; id: number; points: SweepPoint[] }
  | { type: 'cancelled'; id: number }
  | { type: 'error'; id: number; message: string };
