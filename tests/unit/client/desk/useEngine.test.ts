import { describe, expect, it, vi } from 'vitest';
import { effectScope, reactive, ref } from 'vue';
import { defaultDesign, evaluateDesign } from '@/engine';
import { useEngine } from '@/composables/useEngine';
import type { EngineRunner } from '@/workers/engineClient';
import { evaluateOutcome } from '@/workers/engineTasks';
import { packResult, type ResultPart } from '@/workers/resultParts';

/** The main-thread runner, counting evaluations. */
function countingRunner(): EngineRunner & { calls: number } {
  const runner = {
    usesWorker: false,
    calls: 0,
    async evaluate(design: Record<string, unknown>) {
      runner.calls++;
      return evaluateOutcome(design);
    },
    compare: vi.fn(),
    sweep: vi.fn(),
  };
  return runner as unknown as EngineRunner & { calls: number };
}

/** A worker-like runner that answers only after 120 ms, reporting `computeMs` as the engine's own time when given. */
function slowRunner(computeMs?: number): EngineRunner {
  return {
    usesWorker: true,
    evaluate: async (design: Record<string, unknown>) => {
      await new Promise((resolve) => setTimeout(resolve, 120));
      const outcome = evaluateOutcome(design);
      return computeMs === undefined ? outcome : { ...outcome, computeMs };
    },
    compare: vi.fn(),
    sweep: vi.fn(),
  } as unknown as EngineRunner;
}

describe('useEngine', () => {
  it('when the inputs are valid, then the result equals the engine’s own evaluation', async () => {
    // Arrange
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const runner = countingRunner();
    const scope = effectScope();
    const engine = scope.run(() => useEngine(() => doc, { runner }))!;
    // Act
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull(), { timeout: 10_000 });
    // Assert
    expect(engine.result.value!.stiffness.min).toEqual(evaluateDesign(defaultDesign('corexy')).stiffness.min);
    expect(engine.issues.value).toEqual([]);
    scope.stop();
  });

  it('when an input becomes invalid, then issues name the field at once and the last result is kept as stale', async () => {
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const runner = countingRunner();
    const scope = effectScope();
    const engine = scope.run(() => useEngine(() => doc, { runner }))!;
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull(), { timeout: 10_000 });
    const first = engine.result.value;
    const calls = runner.calls;
    // Act
    doc.pulley.driveTeeth = 3;
    await vi.waitFor(() => expect(engine.fieldErrors.value['pulley.driveTeeth']).toBe('drive pulley teeth must be at least 6'));
    // Assert
    expect(engine.result.value).toBe(first);
    expect(engine.isStale.value).toBe(true);
    expect(runner.calls).toBe(calls);
    scope.stop();
  });

  it('when the belt gets wider, then a new result arrives with a different stiffness map', async () => {
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const scope = effectScope();
    const engine = scope.run(() => useEngine(() => doc, { runner: countingRunner() }))!;
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull(), { timeout: 10_000 });
    const before = engine.result.value!.stiffness.min.frequencyHz;
    // Act: a wider belt of the same specific stiffness has a larger EA
    doc.belt.widthMm = 9;
    doc.belt.axialStiffnessN = 60000;
    // Assert
    await vi.waitFor(() => expect(engine.result.value!.stiffness.min.frequencyHz).toBeGreaterThan(before), { timeout: 10_000 });
    scope.stop();
  });

  it('when the runner reports the engine’s own time, then "computed in" shows that time and not the wait for the runner', async () => {
    // Arrange: a runner that answers after a long wait (a worker still warming up) with a short engine time
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const runner = slowRunner(7.4);
    const scope = effectScope();
    // Act
    const engine = scope.run(() => useEngine(() => doc, { runner }))!;
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull(), { timeout: 10_000 });
    // Assert
    expect(engine.lastDurationMs.value).toBe(7);
    scope.stop();
  });

  it('when the runner does not report the engine’s time, then "computed in" is the round trip', async () => {
    // Arrange
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const runner = slowRunner();
    const scope = effectScope();
    // Act
    const engine = scope.run(() => useEngine(() => doc, { runner }))!;
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull(), { timeout: 10_000 });
    // Assert
    expect(engine.lastDurationMs.value).toBeGreaterThanOrEqual(119);
    scope.stop();
  });

  it('when inputs change while an evaluation runs, then only the newest waits and it runs right after (no fixed wait)', async () => {
    // Arrange: a runner whose evaluations finish only when released
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const seen: number[] = [];
    const releases: (() => void)[] = [];
    const runner = {
      usesWorker: false,
      evaluate: (design: Record<string, unknown>) =>
        new Promise((resolve) => {
          seen.push((design.belt as { widthMm: number }).widthMm);
          releases.push(() => resolve(evaluateOutcome(design)));
        }),
      compare: vi.fn(),
      sweep: vi.fn(),
    } as unknown as EngineRunner;
    const scope = effectScope();
    scope.run(() => useEngine(() => doc, { runner }));
    await vi.waitFor(() => expect(seen).toHaveLength(1));
    // Act: three edits while the first evaluation is out
    doc.belt.widthMm = 7;
    await Promise.resolve();
    doc.belt.widthMm = 8;
    await Promise.resolve();
    doc.belt.widthMm = 9;
    await vi.waitFor(() => expect(releases).toHaveLength(1));
    releases[0]();
    // Assert: the next evaluation is the newest inputs only
    await vi.waitFor(() => expect(seen).toHaveLength(2));
    expect(seen[1]).toBe(9);
    scope.stop();
  });

  it('when the visible tab needs a part the result lacks, then it is completed without a new evaluation', async () => {
    // Arrange: a runner that leaves the stiffness map out until asked
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const full = evaluateDesign(defaultDesign('corexy'));
    const { light } = packResult(full, []);
    let evaluations = 0;
    const runner = {
      usesWorker: true,
      async evaluate() {
        evaluations++;
        return { ok: true, result: light, missing: ['map', 'directions'] };
      },
      async completeParts(_result: unknown, parts: string[]) {
        return parts.includes('map') ? { ...light, stiffness: full.stiffness } : light;
      },
      compare: vi.fn(),
      sweep: vi.fn(),
    } as unknown as EngineRunner;
    const parts = ref<ResultPart[]>([]);
    const scope = effectScope();
    const engine = scope.run(() => useEngine(() => doc, { runner, parts: () => parts.value }))!;
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull());
    expect(engine.result.value!.stiffness.lowestFrequencyHz).toEqual([]);
    // Act
    parts.value = ['map'];
    // Assert
    await vi.waitFor(() => expect(engine.result.value!.stiffness.lowestFrequencyHz).toEqual(full.stiffness.lowestFrequencyHz));
    expect(engine.missingParts.value).toEqual(['directions']);
    expect(evaluations).toBe(1);
    scope.stop();
  });

  it('when the page asks for parts from a reactive list, then what goes to the worker can be cloned', async () => {
    // fix: the visible tab's parts were a reactive array, which postMessage refused ("could not be cloned")
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const sent: unknown[] = [];
    const runner = {
      usesWorker: true,
      async evaluate(design: Record<string, unknown>, options: unknown) {
        sent.push(structuredClone({ design, options })); // what postMessage does
        return evaluateOutcome(design);
      },
      compare: vi.fn(),
      sweep: vi.fn(),
    } as unknown as EngineRunner;
    const shown = reactive({ parts: ['map'] as ResultPart[] });
    const scope = effectScope();
    const engine = scope.run(() => useEngine(() => doc, { runner, parts: () => shown.parts }))!;

    await vi.waitFor(() => expect(engine.result.value).not.toBeNull());

    expect(engine.error.value).toBeNull();
    expect(sent[0]).toMatchObject({ options: { validated: true, parts: ['map'] } });
    scope.stop();
  });
});
