import { describe, expect, it, vi } from 'vitest';
import { effectScope, reactive } from 'vue';
import { defaultDesign, evaluateDesign } from '@/engine';
import { useEngine } from '@/composables/useEngine';
import type { EngineRunner } from '@/workers/engineClient';
import { evaluateOutcome } from '@/workers/engineTasks';

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

describe('useEngine', () => {
  it('when the inputs are valid, then the result equals the engine’s own evaluation', async () => {
    // Arrange
    const doc = reactive(structuredClone(defaultDesign('corexy')));
    const runner = countingRunner();
    const scope = effectScope();
    const engine = scope.run(() => useEngine(() => doc, { delayMs: 0, runner }))!;
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
    const engine = scope.run(() => useEngine(() => doc, { delayMs: 0, runner }))!;
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
    const engine = scope.run(() => useEngine(() => doc, { delayMs: 0, runner: countingRunner() }))!;
    await vi.waitFor(() => expect(engine.result.value).not.toBeNull(), { timeout: 10_000 });
    const before = engine.result.value!.stiffness.min.frequencyHz;
    // Act: a wider belt of the same specific stiffness has a larger EA
    doc.belt.widthMm = 9;
    doc.belt.axialStiffnessN = 60000;
    // Assert
    await vi.waitFor(() => expect(engine.result.value!.stiffness.min.frequencyHz).toBeGreaterThan(before), { timeout: 10_000 });
    scope.stop();
  });
});
