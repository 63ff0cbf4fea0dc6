import { onScopeDispose, ref, watch, type Ref } from 'vue';
import { isApiError } from '@/api/http';
import type { VersionConflictDetails } from '@/api/designs';

/** Where saving stands, for the status indicator. */
export type SaveStatus =
  /** Everything is saved. */
  | 'saved'
  /** Changes wait for the quiet time to pass. */
  | 'pending'
  /** A save is on its way. */
  | 'saving'
  /** Changes are not saved because the inputs are invalid. */
  | 'invalid'
  /** The last save failed (network, server); the next change or "Save now" tries again. */
  | 'error'
  /** Someone else saved in between: waiting for the person's choice. */
  | 'conflict'
  /** The person chose to keep editing without saving after a conflict. */
  | 'paused';

/** The three ways out of a version conflict. */
export type ConflictChoice = 'theirs' | 'mine' | 'keep';

/** Options of {@link useAutosave}. */
export interface UseAutosaveOptions<T> {
  /** What to save; watched deeply. null while nothing is loaded. */
  source: () => T | null;
  /** The version the client last saw; updated after each save. */
  version: Ref<number>;
  /** false while the payload must not be saved (read-only, or invalid inputs → status "invalid"). */
  canSave: () => boolean;
  /** true when the payload cannot be saved because it is invalid (shown as "invalid", not "saved"). */
  isInvalid?: () => boolean;
  /** Sends the payload with a version; resolves to the new version. A 409 must reject with the API error. */
  save: (payload: T, version: number) => Promise<{ version: number }>;
  /** Replaces the local payload and version with the stored design ("reload theirs"). */
  reload: () => Promise<void>;
  /** Quiet time after the last change [ms]. */
  delayMs?: number;
}

/** What {@link useAutosave} returns. */
export interface UseAutosave {
  status: Ref<SaveStatus>;
  /** When the last save succeeded. */
  savedAt: Ref<Date | null>;
  /** Message of the last failure. */
  lastError: Ref<string | null>;
  /** Details of the conflict waiting for a choice (or kept aside with "keep editing"). */
  conflict: Ref<VersionConflictDetails | null>;
  /** True while the conflict dialog should be open. */
  isConflictOpen: Ref<boolean>;
  /** True when there are changes that are not saved. */
  hasUnsavedChanges: () => boolean;
  /** Saves now (skips the quiet time). Resolves when done. */
  flush: () => Promise<void>;
  /** Acts on the person's choice in the conflict dialog. */
  resolveConflict: (choice: ConflictChoice) => Promise<void>;
  /** Takes the current payload as saved (after loading a design). */
  markSaved: () => void;
}

function snapshot(value: unknown): string {
  // NaN and ±∞ would serialise as null; keep them distinct so an invalid edit never looks "saved".
  return JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? `#${String(v)}` : v));
}

function conflictDetails(err: unknown): VersionConflictDetails | null {
  if (!isApiError(err) || err.status !== 409) return null;
  const body = err.body as { error?: { code?: string; details?: unknown } } | undefined;
  const details = body?.error?.details as Partial<VersionConflictDetails> | undefined;
  if (err.code !== 'version_conflict' && typeof details?.currentVersion !== 'number') return null;
  return {
    currentVersion: typeof details?.currentVersion === 'number' ? details.currentVersion : Number.NaN,
    // A conflict without details (an older server, another route) still opens the dialog: "Someone", no date.
    updatedBy: details?.updatedBy ?? null,
    updatedAt: details?.updatedAt ?? '',
  };
}

/**
 * Debounced autosave with optimistic locking. Each change waits `delayMs` of quiet, then the payload is sent
 * with the version last seen. A 409 version conflict never overwrites silently: saving stops and the person
 * chooses — reload theirs, overwrite with mine (re-send with the version now stored), or keep editing without
 * saving (a later "Save now" asks again).
 * @param options - source, version, guards, save and reload functions
 */
export function useAutosave<T>(options: UseAutosaveOptions<T>): UseAutosave {
  const delayMs = options.delayMs ?? 800;
  const status = ref<SaveStatus>('saved');
  const savedAt = ref<Date | null>(null);
  const lastError = ref<string | null>(null);
  const conflict = ref<VersionConflictDetails | null>(null);
  const isConflictOpen = ref(false);

  let savedSnapshot: string | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let inFlight: Promise<void> | null = null;

  const current = (): string | null => {
    const value = options.source();
    return value === null ? null : snapshot(value);
  };
  const hasUnsavedChanges = (): boolean => {
    const now = current();
    return now !== null && now !== savedSnapshot;
  };

  function clearTimer(): void {
    if (timer) clearTimeout(timer);
    timer = null;
  }

  function markSaved(): void {
    clearTimer();
    savedSnapshot = current();
    status.value = 'saved';
  }

  /** Decides the status after a change, and schedules a save when one is due. */
  function evaluate(): void {
    if (status.value === 'conflict' || status.value === 'paused') return; // waiting for the person
    if (!hasUnsavedChanges()) {
      clearTimer();
      if (status.value !== 'saving') status.value = 'saved';
      return;
    }
    if (options.isInvalid?.()) {
      clearTimer();
      status.value = 'invalid';
      return;
    }
    if (!options.canSave()) {
      clearTimer();
      return;
    }
    if (status.value !== 'saving') status.value = 'pending';
    clearTimer();
    timer = setTimeout(() => {
      timer = null;
      void saveNow();
    }, delayMs);
  }

  async function saveNow(): Promise<void> {
    if (inFlight) {
      await inFlight;
      if (hasUnsavedChanges()) evaluate();
      return;
    }
    const payload = options.source();
    if (payload === null || !options.canSave() || options.isInvalid?.()) return;
    const sent = snapshot(payload);
    status.value = 'saving';
    inFlight = (async () => {
      try {
        const { version } = await options.save(payload, options.version.value);
        options.version.value = version;
        savedSnapshot = sent;
        savedAt.value = new Date();
        lastError.value = null;
        conflict.value = null;
        status.value = 'saved';
      } catch (err) {
        const details = conflictDetails(err);
        if (details) {
          conflict.value = details;
          isConflictOpen.value = true;
          status.value = 'conflict';
        } else {
          lastError.value = err instanceof Error ? err.message : 'The design could not be saved.';
          status.value = 'error';
        }
      } finally {
        inFlight = null;
      }
    })();
    await inFlight;
    // Changes made while the save was on its way get their own save.
    if ((status.value as SaveStatus) === 'saved' && hasUnsavedChanges()) evaluate();
  }

  async function flush(): Promise<void> {
    clearTimer();
    if (status.value === 'paused') status.value = 'pending'; // "Save now" after "keep editing": try again, and ask again on 409
    if (status.value === 'conflict') {
      isConflictOpen.value = true;
      return;
    }
    if (hasUnsavedChanges()) await saveNow();
  }

  async function resolveConflict(choice: ConflictChoice): Promise<void> {
    isConflictOpen.value = false;
    const details = conflict.value;
    if (choice === 'keep') {
      status.value = 'paused';
      return;
    }
    if (choice === 'theirs') {
      clearTimer();
      try {
        await options.reload();
        conflict.value = null;
        markSaved();
      } catch (err) {
        lastError.value = err instanceof Error ? err.message : 'The stored design could not be loaded.';
        status.value = 'conflict';
        isConflictOpen.value = true;
      }
      return;
    }
    // "mine": overwrite deliberately, by sending with the version that is stored now.
    if (details && Number.isFinite(details.currentVersion)) options.version.value = details.currentVersion;
    conflict.value = null;
    status.value = 'pending';
    await saveNow();
  }

  watch(() => current(), evaluate);

  const onBeforeUnload = (event: BeforeUnloadEvent): void => {
    if (hasUnsavedChanges() && options.canSave()) {
      event.preventDefault();
      event.returnValue = '';
    }
  };
  if (typeof window !== 'undefined') window.addEventListener('beforeunload', onBeforeUnload);

  onScopeDispose(() => {
    clearTimer();
    if (typeof window !== 'undefined') window.removeEventListener('beforeunload', onBeforeUnload);
  });

  return { status, savedAt, lastError, conflict, isConflictOpen, hasUnsavedChanges, flush, resolveConflict, markSaved };
}
