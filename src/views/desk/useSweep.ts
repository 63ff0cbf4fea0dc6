import { computed, onScopeDispose, ref, shallowRef } from 'vue';
import { getAt, safeParseDesign, type SweepPoint } from '@/engine';
import { getEngineRunner, type EngineRunner } from '@/workers/engineClient';
import { SWEEPABLE_FIELDS, type FieldDef } from './fields';

/** Most points one sweep may have. */
export const SWEEP_MAX_STEPS = 60;

/**
 * Values of a sweep from `from` to `to` in `steps` evenly spaced points; whole numbers (teeth) are rounded and
 * repeated values dropped.
 * @param from - first value (stored units)
 * @param to - last value (stored units)
 * @param steps - number of points, 2 or more
 * @param isInteger - round to whole numbers
 */
export function sweepValues(from: number, to: number, steps: number, isInteger = false): number[] {
  const n = Math.max(2, Math.min(SWEEP_MAX_STEPS, Math.round(steps)));
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const v = from + ((to - from) * i) / (n - 1);
    const value = isInteger ? Math.round(v) : v;
    if (!out.includes(value)) out.push(value);
  }
  return out;
}

/**
 * The Sweep tab: choose one numeric input, a range and a number of steps, run the engine at each point (in the
 * worker, point by point through the engine's sweepPoint, with progress) and keep the points for the plots. A run can be stopped.
 * @param source - getter of the design being edited
 * @param runner - engine runner (tests pass the main-thread one)
 */
export function useSweep(source: () => unknown, runner: EngineRunner = getEngineRunner()) {
  const fieldPath = ref<string>('pulley.driveTeeth');
  const from = ref<number | null>(null);
  const to = ref<number | null>(null);
  const steps = ref(11);
  const points = shallowRef<SweepPoint[]>([]);
  const done = ref(0);
  const total = ref(0);
  const isRunning = ref(false);
  const error = ref<string | null>(null);
  /** The field the shown points were computed for (the choice may have changed since). */
  const sweptField = shallowRef<FieldDef | null>(null);
  let controller: AbortController | null = null;

  const field = computed(() => SWEEPABLE_FIELDS.find((f) => f.path === fieldPath.value) ?? SWEEPABLE_FIELDS[0]);

  /** Proposes a range around the current value: half to one and a half times it (teeth: ±50 %, at least 6). */
  function suggestRange(): void {
    const current = getAt(source(), field.value.path);
    const v = typeof current === 'number' && Number.isFinite(current) && current > 0 ? current : 1;
    if (field.value.isInteger) {
      from.value = Math.max(field.value.path.startsWith('pulley.') ? 6 : 1, Math.round(v * 0.5));
      to.value = Math.max(from.value + 1, Math.round(v * 1.5));
      steps.value = Math.min(SWEEP_MAX_STEPS, to.value - from.value + 1);
    } else {
      from.value = v * 0.5;
      to.value = v * 1.5;
      steps.value = 11;
    }
  }

  const rangeProblem = computed(() => {
    if (from.value === null || to.value === null || !Number.isFinite(from.value) || !Number.isFinite(to.value))
      return 'Enter both ends of the range.';
    if (from.value === to.value) return 'The range needs two different ends.';
    if (!Number.isInteger(steps.value) || steps.value < 2 || steps.value > SWEEP_MAX_STEPS)
      return `Steps must be a whole number from 2 to ${SWEEP_MAX_STEPS}.`;
    return null;
  });

  async function run(): Promise<void> {
    if (isRunning.value || rangeProblem.value) return;
    const parsed = safeParseDesign(source());
    if (!parsed.ok) {
      error.value = 'Fix the inputs marked on the left first: a sweep starts from a valid design.';
      return;
    }
    const values = sweepValues(from.value!, to.value!, steps.value, field.value.isInteger);
    controller = new AbortController();
    isRunning.value = true;
    error.value = null;
    done.value = 0;
    total.value = values.length;
    points.value = [];
    sweptField.value = field.value;
    const collected: SweepPoint[] = [];
    try {
      await runner.sweep(
        parsed.value as unknown as Record<string, unknown>,
        { path: field.value.path, values },
        (d, t, point) => {
          done.value = d;
          total.value = t;
          collected.push(point);
          points.value = [...collected];
        },
        controller.signal,
      );
    } catch (err) {
      if (!(err instanceof DOMException && err.name === 'AbortError')) error.value = err instanceof Error ? err.message : String(err);
    } finally {
      isRunning.value = false;
      controller = null;
    }
  }

  function stop(): void {
    controller?.abort();
  }

  onScopeDispose(stop);

  return {
    fields: SWEEPABLE_FIELDS,
    fieldPath,
    field,
    from,
    to,
    steps,
    points,
    done,
    total,
    isRunning,
    error,
    rangeProblem,
    sweptField,
    suggestRange,
    run,
    stop,
  };
}
