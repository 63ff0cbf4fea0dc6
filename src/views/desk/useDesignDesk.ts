import { computed, ref, shallowRef, watch, type Ref } from 'vue';
import { storeToRefs } from 'pinia';
import { getDesign, updateDesign, type Design } from '@/api/designs';
import { isApiError } from '@/api/http';
import { getAt, safeParseDesign, setAt, type DesignInputRaw, type Mechanism } from '@/engine';
import { useAutosave } from '@/composables/useAutosave';
import { useEngine } from '@/composables/useEngine';
import { getEngineRunner } from '@/workers/engineClient';
import type { ResultPart } from '@/workers/resultParts';
import { useAuthStore } from '@/stores/auth';
import { errorMessage } from '@/utils/message';
import { readOnlyReasonText } from '@/format';

/** A design document being edited (loosely typed: values may be NaN or null while someone types). */
export type EditableDesign = Record<string, unknown> & { name: string; mechanism: Mechanism };

/**
 * State and actions of the Design desk for one design: loading, editing, live results, autosave with
 * conflict handling, and who may edit.
 * @param id - the design id from the route
 */
export function useDesignDesk(id: Ref<number>) {
  const auth = useAuthStore();
  const { user } = storeToRefs(auth);

  /** The design as last loaded or saved (status, owner, …). */
  const design = shallowRef<Design | null>(null);
  /** The document being edited. */
  const model = ref<EditableDesign | null>(null);
  const version = ref(0);
  const isLoading = ref(true);
  const loadError = ref<string | null>(null);
  const notFound = ref(false);

  const isOwner = computed(() => !!design.value && !!user.value && design.value.owner?.id === user.value.id);
  /** Whether this user may edit the inputs now, and if not why: the server decides (access rules and state). */
  const editable = computed(() => design.value?.editable ?? null);
  const canEdit = computed(() => editable.value?.ok ?? false);
  /** Why the inputs are read-only, in one sentence (null when editable or not loaded). */
  const readOnlyReason = computed(() => {
    const e = editable.value;
    return e && !e.ok ? readOnlyReasonText(e.reason, design.value?.owner.name ?? '') : null;
  });

  /** Large result parts the visible result tab draws (the view sets it); others are fetched when a tab needs them. */
  const shownParts = ref<ResultPart[]>([]);
  // Start the engine worker and compile the engine while the design is still loading, so the first edit is fast.
  void getEngineRunner()
    .warm?.()
    .catch(() => undefined);
  const engine = useEngine(() => model.value, { parts: () => shownParts.value });

  function adopt(loaded: Design): void {
    design.value = loaded;
    version.value = loaded.version;
    const parsed = safeParseDesign(loaded.inputs);
    // A valid document is shown with its defaults written out; an invalid one as stored, with its issues.
    const doc = (parsed.ok ? parsed.value : structuredClone(loaded.inputs)) as unknown as EditableDesign;
    model.value = doc;
  }

  async function fetchDesign(): Promise<Design> {
    return getDesign(id.value);
  }

  const autosave = useAutosave<{ inputs: EditableDesign }>({
    source: () => (model.value ? { inputs: model.value } : null),
    version,
    canSave: () => canEdit.value,
    isInvalid: () => engine.issues.value.length > 0,
    save: async (payload, v) => {
      const saved = await updateDesign(id.value, {
        inputs: payload.inputs as unknown as DesignInputRaw,
        name: payload.inputs.name,
        version: v,
      });
      design.value = { ...saved, inputs: design.value?.inputs ?? saved.inputs };
      return { version: saved.version };
    },
    reload: async () => {
      adopt(await fetchDesign());
    },
  });

  async function load(): Promise<void> {
    isLoading.value = true;
    loadError.value = null;
    notFound.value = false;
    try {
      adopt(await fetchDesign());
      autosave.markSaved();
    } catch (err) {
      if (isApiError(err) && (err.status === 404 || err.status === 400)) notFound.value = true;
      loadError.value = errorMessage(err, 'The design could not be loaded.');
    } finally {
      isLoading.value = false;
    }
  }

  /**
   * Reads an input by dotted path.
   * @param path - e.g. "belt.widthMm"
   */
  function get(path: string): unknown {
    return getAt(model.value, path);
  }

  /**
   * Changes an input by dotted path (ignored when read-only).
   * @param path - e.g. "belt.widthMm"
   * @param value - new stored value
   */
  function set(path: string, value: unknown): void {
    if (!model.value || !canEdit.value) return;
    setAt(model.value, path, value);
    if (path === 'mechanism' && value !== 'cartesian') model.value.yMotors = 1;
  }

  /**
   * Writes several inputs at once (a part picked from the shelf).
   * @param values - dotted path → stored value
   */
  function setMany(values: Record<string, unknown>): void {
    for (const [path, value] of Object.entries(values)) set(path, value);
  }

  watch(id, () => void load(), { immediate: true });

  return {
    design,
    model,
    version,
    isLoading,
    loadError,
    notFound,
    canEdit,
    isOwner,
    readOnlyReason,
    engine,
    shownParts,
    autosave,
    load,
    get,
    set,
    setMany,
  };
}
