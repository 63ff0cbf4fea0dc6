import { computed, nextTick, onScopeDispose, ref, shallowRef, toRaw, watch, type Ref, type ShallowRef } from 'vue';
import { designInputSchema, getAt, safeParseDesign, type DesignResult, type InputIssue } from '@/engine';
import { getEngineRunner, type EngineRunner } from '@/workers/engineClient';
import type { ResultPart } from '@/workers/resultParts';

/** Options of {@link useEngine}. */
export interface UseEngineOptions {
  /** Engine runner (tests pass the main-thread one). */
  runner?: EngineRunner;
  /** Large result parts the page shows now (the visible tab's); all of them when absent. */
  parts?: () => ResultPart[];
}

/** What {@link useEngine} returns. */
export interface UseEngine {
  /** Latest result, kept while the inputs are invalid or a new one is on its way. */
  result: ShallowRef<DesignResult | null>;
  /** Schema issues of the current inputs (the API answers the same messages). */
  issues: Ref<InputIssue[]>;
  /** First message per dotted field path. */
  fieldErrors: Ref<Record<string, string>>;
  /** True when the shown result does not match the current inputs. */
  isStale: Ref<boolean>;
  /** True while the engine runs. */
  isComputing: Ref<boolean>;
  /** An unexpected engine failure (not a validation issue). */
  error: Ref<string | null>;
  /** How long the engine took for the last evaluation (its own time when the runner reports it, else the round trip) [ms]. */
  lastDurationMs: Ref<number | null>;
  /** Large parts the current result lacks (the visible tab waits for them). */
  missingParts: Ref<ResultPart[]>;
}

/**
 * The schema's issues for the form. A box holding text that is not a number carries NaN, which the shared
 * schema rejects with its own "… must be a number" message; the issue list reports every wrong type as
 * "is required", so for NaN the schema's own words are taken instead (JSON cannot carry NaN, so the API never
 * sees this case).
 * @param value - the design being edited
 * @param issues - issues from safeParseDesign
 */
export function formIssues(value: unknown, issues: InputIssue[]): InputIssue[] {
  if (!issues.some((i) => Number.isNaN(getAt(value, i.path)))) return issues;
  const raw = designInputSchema.safeParse(value);
  const own = new Map<string, string>();
  if (!raw.success) for (const i of raw.error.issues) own.set(i.path.map(String).join('.'), i.message);
  return issues.map((i) => (Number.isNaN(getAt(value, i.path)) && own.has(i.path) ? { path: i.path, message: own.get(i.path)! } : i));
}

/**
 * Names of the performance marks the Design desk leaves for `npm run bench` (scripts/bench/editor.ts reads them):
 * an input changed, an evaluation was sent, its result arrived, its numbers are on screen (after the next paint).
 */
export const PERF_MARKS = { input: 'gw:input', evaluate: 'gw:evaluate', result: 'gw:result', numbers: 'gw:numbers' } as const;

/** Marks `name` once the next frame has been painted (a task queued from rAF runs after the paint). */
export function markAfterPaint(name: string, detail?: unknown): void {
  if (typeof performance === 'undefined' || typeof requestAnimationFrame === 'undefined') return;
  requestAnimationFrame(() => setTimeout(() => performance.mark(name, { detail }), 0));
}

/**
 * Live results for a design being edited: every change is validated at once with the shared schema (so the
 * form shows field messages as the person types), and a valid design goes to the engine worker at once
 * (validated once: the worker does not parse it again). Evaluations never pile up: while one runs, only the
 * newest inputs wait, and they go as soon as it returns (a trailing throttle, with no fixed wait). Only the
 * large result parts the visible tab needs travel; the others are fetched when a tab asks for them.
 * @param source - getter of the design document being edited (null while nothing is loaded)
 * @param options - runner and the parts shown
 */
export function useEngine(source: () => unknown, options: UseEngineOptions = {}): UseEngine {
  const runner = options.runner ?? getEngineRunner();
  const wantedParts = options.parts;

  const result = shallowRef<DesignResult | null>(null);
  const issues = ref<InputIssue[]>([]);
  const isStale = ref(false);
  const isComputing = ref(false);
  const error = ref<string | null>(null);
  const lastDurationMs = ref<number | null>(null);
  const missingParts = ref<ResultPart[]>([]);

  let waiting: Record<string, unknown> | null = null;
  let isDisposed = false;

  /** Sets the issues only when they differ, so an unchanged list does not re-render the whole form. */
  function setIssues(next: InputIssue[]): void {
    const a = issues.value;
    if (a.length === next.length && a.every((x, i) => x.path === next[i].path && x.message === next[i].message)) return;
    issues.value = next;
  }

  const fieldErrors = computed(() => {
    const out: Record<string, string> = {};
    for (const issue of issues.value) if (!(issue.path in out)) out[issue.path] = issue.message;
    return out;
  });

  function markNumbers(): void {
    void nextTick(() => markAfterPaint(PERF_MARKS.numbers));
  }

  async function run(design: Record<string, unknown>): Promise<void> {
    isComputing.value = true;
    const started = performance.now();
    try {
      performance.mark?.(PERF_MARKS.evaluate);
      // A plain copy: the page's list is reactive (a proxy), which postMessage cannot clone.
      const parts = wantedParts ? [...toRaw(wantedParts())] : undefined;
      const outcome = await runner.evaluate(design, { validated: true, parts });
      if (isDisposed) return;
      performance.mark?.(PERF_MARKS.result);
      // The engine's own time when the runner reports it: the first run after a page load also waits for the
      // worker to start and warm up, which the label "computed in" should not count.
      lastDurationMs.value = Math.round(outcome.computeMs ?? performance.now() - started);
      if (outcome.ok) {
        result.value = outcome.result;
        missingParts.value = outcome.missing ?? [];
        error.value = null;
        markNumbers();
      } else {
        // The layout can reject what the field rules let through; show it like any other issue.
        setIssues(outcome.issues);
      }
    } catch (err) {
      if (!isDisposed) error.value = err instanceof Error ? err.message : String(err);
    } finally {
      if (!isDisposed) {
        if (waiting) {
          const next = waiting;
          waiting = null;
          void run(next);
        } else {
          isComputing.value = false;
          isStale.value = issues.value.length > 0;
        }
      }
    }
  }

  /** Trailing throttle: run now when idle; while a run is out, keep only the newest inputs for right after it. */
  function schedule(design: Record<string, unknown>): void {
    if (isComputing.value) waiting = design;
    else void run(design);
  }

  watch(
    source,
    (value) => {
      if (value === null || value === undefined) return;
      performance.mark?.(PERF_MARKS.input);
      const parsed = safeParseDesign(value);
      if (!parsed.ok) {
        setIssues(formIssues(value, parsed.issues));
        isStale.value = result.value !== null;
        waiting = null;
        return;
      }
      setIssues([]);
      isStale.value = true;
      schedule(parsed.value as unknown as Record<string, unknown>);
    },
    { deep: true, immediate: true },
  );

  // A tab that needs a part the current result lacks fetches it from the worker's copy (no new evaluation).
  if (wantedParts) {
    watch(wantedParts, async (parts) => {
      const current = result.value;
      if (!current || !parts.some((p) => missingParts.value.includes(p)) || !runner.completeParts) return;
      const completed = await runner.completeParts(current, parts);
      if (isDisposed || result.value !== current) return; // a newer result arrived meanwhile
      if (completed) {
        result.value = completed;
        missingParts.value = missingParts.value.filter((p) => !parts.includes(p));
        markNumbers();
      } else {
        const doc = source();
        const parsed = doc ? safeParseDesign(doc) : null;
        if (parsed?.ok) schedule(parsed.value as unknown as Record<string, unknown>);
      }
    });
  }

  onScopeDispose(() => {
    isDisposed = true;
  });

  return { result, issues, fieldErrors, isStale, isComputing, error, lastDurationMs, missingParts };
}
