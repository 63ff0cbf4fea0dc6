import { createHash } from 'node:crypto';
import { Piscina } from 'piscina';
import { ENGINE_VERSION, EngineInputError, type DesignInput } from '@/engine';
import { AppError } from '../errors';
import { parsePart } from '../middleware/validate';
import * as schemas from '../schemas/calc.schema';
import * as service from '../services/calc.service';
import type { SheetInput } from '../sheet/types';
import { pickSections, type ResultSection } from './sections';

/**
 * The work the server hands to its worker threads (see pool.ts). Each task returns plain data; an AppError
 * thrown here cannot cross the thread boundary with its code and details, so it travels as a `failure` and the
 * pool turns it back into an AppError on the main thread.
 */

// Modules only some threads need (the models, pdfmake) load on first use, once: every import() goes through the
// tsx loader's hooks, which costs more than a small task, so it must not happen per task.
let freezeModule: Promise<typeof import('../services/freezeRevision')> | undefined;
let designsModule: Promise<typeof import('../services/designs.service')> | undefined;
let sheetModule: Promise<typeof import('../sheet/renderSheet')> | undefined;

/** An AppError in a form that survives structured cloning. */
export interface TaskFailure {
  failure: { code: string; message: string; status: number; details?: unknown };
}

/** What a task answers: its value, or an operational failure. */
export type TaskAnswer<T> = { value: T } | TaskFailure;

function answer<T>(fn: () => T): TaskAnswer<T> {
  try {
    return { value: fn() };
  } catch (err) {
    if (err instanceof AppError && err.isOperational) {
      return { failure: { code: err.code, message: err.message, status: err.status, details: err.details } };
    }
    if (err instanceof EngineInputError) {
      return { failure: { code: 'engine_input', message: err.message, status: 400, details: err.issues } };
    }
    throw err;
  }
}

/** Arguments of {@link calc}. */
export interface CalcTask {
  /** Which engine entry: one result, the three mechanisms side by side, or a sweep of one input. */
  kind: 'result' | 'compare' | 'sweep';
  /** The request body as it arrived (UTF-8 JSON), or null when there was none. */
  body: Uint8Array | null;
}

const INVALID_JSON: TaskFailure = { failure: { code: 'invalid_json', message: 'The request body is not valid JSON.', status: 400 } };

/** Parses a body the way the API's JSON parser does (strict: an object or an array at the top). */
function parseBody(body: Uint8Array | null): { ok: true; value: unknown } | { ok: false } {
  if (!body || body.byteLength === 0) return { ok: true, value: undefined };
  const text = Buffer.from(body.buffer, body.byteOffset, body.byteLength).toString('utf8');
  const first = /^[\x20\x09\x0a\x0d]*(.)/.exec(text)?.[1];
  if (first !== '{' && first !== '[') return { ok: false };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false };
  }
}

/** JSON as UTF-8 bytes that own their ArrayBuffer, so they can be moved (not copied) to the main thread. */
function jsonBytes(value: unknown): Uint8Array {
  const bytes = Buffer.from(JSON.stringify(value), 'utf8');
  // A small Buffer may share its ArrayBuffer with others (Node's pool) and cannot be moved: give it its own.
  return bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? bytes : new Uint8Array(bytes);
}

/**
 * POST /api/calc, /compare and /sweep, everything after sign-in: parses and validates the body (same messages as
 * the validate middleware), runs the engine and serialises the answer, so that the main thread only reads and
 * writes bytes (turning a full result into JSON costs as much as computing it).
 * @returns the UTF-8 JSON answer, moved to the main thread without a copy, or a failure (400 naming the field)
 */
export async function calc(task: CalcTask): Promise<Uint8Array | TaskFailure> {
  const json = parseBody(task.body);
  if (!json.ok) return INVALID_JSON;
  const schema = task.kind === 'compare' ? schemas.compareSchema : task.kind === 'sweep' ? schemas.sweepSchema : schemas.calcSchema;
  // The same checks as the validate middleware, lone surrogates included (they name the field, never a 500).
  const parsed = parsePart(schema, json.value, 'body');
  if (!parsed.ok) {
    return { failure: { code: 'validation_failed', message: 'The request is not valid.', status: 400, details: parsed.details } };
  }
  const body = parsed.data as { design: DesignInput; sections?: ResultSection[]; path?: string; values?: number[] };
  let out: TaskAnswer<unknown>;
  if (task.kind === 'compare') out = answer(() => service.compare(body.design));
  else if (task.kind === 'sweep') {
    try {
      out = { value: await service.sweepInput(body.design, body.path ?? '', body.values ?? [], { yieldBetween: false }) };
    } catch (err) {
      out = answer(() => {
        throw err;
      });
    }
  } else out = answer(() => pickSections(service.calculate(body.design), body.sections));
  if ('failure' in out) return out;
  return Piscina.move(jsonBytes(out.value)) as unknown as Uint8Array;
}

/** Freezes a revision's content (validation, engine, fingerprint) off the main thread. */
export async function freeze(
  storedInputs: unknown,
): Promise<TaskAnswer<ReturnType<typeof import('../services/freezeRevision').freezeDesign>>> {
  // Loaded on first use only: the calc-only threads never load the models.
  const { freezeDesign } = await (freezeModule ??= import('../services/freezeRevision'));
  return answer(() => freezeDesign(storedInputs));
}

/** Travel and the list summary of a design, computed on every save. */
export async function storedResults(task: {
  document: DesignInput;
  pathPrefix?: string;
}): Promise<TaskAnswer<ReturnType<typeof import('../services/designs.service').computeStoredResults>>> {
  const { computeStoredResults } = await (designsModule ??= import('../services/designs.service'));
  return answer(() => computeStoredResults(task.document, task.pathPrefix));
}

/**
 * A design sheet in A4 and US Letter with their SHA-256 (pdfmake is slow: 0.3–0.4 s per paper size in a warm thread,
 * whose words are already shaped, see server/sheet/shapingCache.ts; over a second in a new one).
 */
export async function renderSheets(
  source: Omit<SheetInput, 'paper'>,
): Promise<{ a4: Uint8Array; a4Sha256: string; letter: Uint8Array; letterSha256: string }> {
  const { renderSheet } = await (sheetModule ??= import('../sheet/renderSheet'));
  // One after the other: pdfmake is a singleton within this thread.
  const a4 = await renderSheet({ ...source, paper: 'A4' });
  const letter = await renderSheet({ ...source, paper: 'LETTER' });
  const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');
  return { a4: new Uint8Array(a4), a4Sha256: sha(a4), letter: new Uint8Array(letter), letterSha256: sha(letter) };
}

/** Loads the engine and answers: used to start threads before the first request needs them. */
export function ping(): string {
  return ENGINE_VERSION;
}
