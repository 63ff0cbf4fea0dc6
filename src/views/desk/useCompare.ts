import { onScopeDispose, ref, shallowRef, watch, type Ref } from 'vue';
import { safeParseDesign, type ComparisonRow } from '@/engine';
import { getEngineRunner, type EngineRunner } from '@/workers/engineClient';

/**
 * The same inputs evaluated under every mechanism (the engine's compareMechanisms, run in the worker), refreshed while the Compare tab is open and the inputs are
 * valid (a short quiet time after the last change).
 * @param source - getter of the design being edited
 * @param isActive - true while the Compare tab shows
 * @param runner - engine runner (tests pass the main-thread one)
 */
export function useCompare(source: () => unknown, isActive: Ref<boolean>, runner: EngineRunner = getEngineRunner()) {
  const columns = shallowRef<ComparisonRow[] | null>(null);
  const isRunning = ref(false);
  const error = ref<string | null>(null);
  let timer: ReturnType<typeof setTimeout> | null = null;
  let ticket = 0;

  async function run(): Promise<void> {
    const parsed = safeParseDesign(source());
    if (!parsed.ok) return;
    const mine = ++ticket;
    isRunning.value = true;
    try {
      const out = await runner.compare(parsed.value as unknown as Record<string, unknown>);
      if (mine === ticket) {
        columns.value = out;
        error.value = null;
      }
    } catch (err) {
      if (mine === ticket) error.value = err instanceof Error ? err.message : String(err);
    } finally {
      if (mine === ticket) isRunning.value = false;
    }
  }

  watch(
    [() => (isActive.value ? JSON.stringify(source()) : null)],
    ([snapshot]) => {
      if (snapshot === null) return;
      if (timer) clearTimeout(timer);
      timer = setTimeout(() => void run(), columns.value ? 400 : 0);
    },
    { immediate: true },
  );

  onScopeDispose(() => {
    if (timer) clearTimeout(timer);
    ticket++;
  });

  return { columns, isRunning, error, run };
}
