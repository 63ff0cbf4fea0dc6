import { afterEach, beforeEach, describe, expect, it, vi, type Mock } from 'vitest';
import { effectScope, nextTick, reactive, ref } from 'vue';
import { ApiError } from '@/api/http';
import { useAutosave } from '@/composables/useAutosave';

/** A 409 exactly as the API answers it (server/services/designs.service.ts versionConflict). */
function conflictError(currentVersion: number): ApiError {
  const body = {
    error: {
      code: 'version_conflict',
      message: `This design was changed by Dana Designer since you opened it (now version ${currentVersion}).`,
      details: { currentVersion, updatedBy: { id: 7, name: 'Dana Designer' }, updatedAt: '2026-01-05T10:00:00.000Z' },
    },
  };
  return new ApiError(409, 'version_conflict', body.error.message, [], body);
}

type Save = Mock<(payload: unknown, version: number) => Promise<{ version: number }>>;

function setup(options: { save?: Save; reload?: Mock<() => Promise<void>> } = {}) {
  const doc = reactive({ inputs: { name: 'Stage', frame: { outerXMm: 460 } } });
  const version = ref(3);
  const save = options.save ?? vi.fn(async (_payload: unknown, v: number) => ({ version: v + 1 }));
  const reload = options.reload ?? vi.fn(async () => undefined);
  const scope = effectScope();
  const autosave = scope.run(() =>
    useAutosave({ source: () => doc, version, canSave: () => true, isInvalid: () => false, save, reload, delayMs: 800 }),
  )!;
  autosave.markSaved();
  return { doc, version, save, reload, autosave, scope };
}

async function edit(doc: ReturnType<typeof setup>['doc'], mm: number): Promise<void> {
  doc.inputs.frame.outerXMm = mm;
  await nextTick();
}

describe('useAutosave', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('when inputs change, then it saves once after 800 ms of quiet with the version last seen', async () => {
    // Arrange
    const { doc, version, save, autosave, scope } = setup();
    // Act
    await edit(doc, 470);
    await vi.advanceTimersByTimeAsync(500);
    await edit(doc, 480);
    await vi.advanceTimersByTimeAsync(799);
    expect(save).not.toHaveBeenCalled();
    expect(autosave.status.value).toBe('pending');
    await vi.advanceTimersByTimeAsync(1);
    // Assert
    expect(save).toHaveBeenCalledTimes(1);
    expect(save.mock.calls[0][1]).toBe(3);
    expect((save.mock.calls[0][0] as { inputs: { frame: { outerXMm: number } } }).inputs.frame.outerXMm).toBe(480);
    expect(version.value).toBe(4);
    expect(autosave.status.value).toBe('saved');
    scope.stop();
  });

  it('when the server answers 409, then it stops and asks instead of overwriting', async () => {
    // Arrange
    const save = vi.fn().mockRejectedValueOnce(conflictError(5));
    const { doc, autosave, scope } = setup({ save });
    // Act
    await edit(doc, 500);
    await vi.advanceTimersByTimeAsync(800);
    await edit(doc, 510);
    await vi.advanceTimersByTimeAsync(5000);
    // Assert
    expect(save).toHaveBeenCalledTimes(1);
    expect(autosave.status.value).toBe('conflict');
    expect(autosave.isConflictOpen.value).toBe(true);
    expect(autosave.conflict.value).toEqual({
      currentVersion: 5,
      updatedBy: { id: 7, name: 'Dana Designer' },
      updatedAt: '2026-01-05T10:00:00.000Z',
    });
    scope.stop();
  });

  it('when "overwrite with mine" is chosen, then it re-sends the inputs with the version now stored', async () => {
    const save = vi.fn().mockRejectedValueOnce(conflictError(5)).mockResolvedValueOnce({ version: 6 });
    const { doc, version, autosave, scope } = setup({ save });
    await edit(doc, 500);
    await vi.advanceTimersByTimeAsync(800);
    // Act
    await autosave.resolveConflict('mine');
    // Assert
    expect(save).toHaveBeenCalledTimes(2);
    expect(save.mock.calls[1][1]).toBe(5);
    expect(version.value).toBe(6);
    expect(autosave.status.value).toBe('saved');
    expect(autosave.isConflictOpen.value).toBe(false);
    scope.stop();
  });

  it('when "reload theirs" is chosen, then it reloads and does not save', async () => {
    const save = vi.fn().mockRejectedValueOnce(conflictError(5));
    const state = { doc: null as ReturnType<typeof setup>['doc'] | null, version: null as ReturnType<typeof setup>['version'] | null };
    const reload = vi.fn(async () => {
      state.doc!.inputs.frame.outerXMm = 999; // their value replaces mine
      state.version!.value = 5;
    });
    const ctx = setup({ save, reload });
    state.doc = ctx.doc;
    state.version = ctx.version;
    await edit(ctx.doc, 500);
    await vi.advanceTimersByTimeAsync(800);
    // Act
    await ctx.autosave.resolveConflict('theirs');
    await vi.advanceTimersByTimeAsync(5000);
    // Assert
    expect(reload).toHaveBeenCalledTimes(1);
    expect(save).toHaveBeenCalledTimes(1);
    expect(ctx.doc.inputs.frame.outerXMm).toBe(999);
    expect(ctx.autosave.status.value).toBe('saved');
    expect(ctx.autosave.hasUnsavedChanges()).toBe(false);
    ctx.scope.stop();
  });

  it('when "keep editing" is chosen, then later edits are not saved until "save now", which asks again', async () => {
    const save = vi.fn().mockRejectedValue(conflictError(5));
    const { doc, autosave, scope } = setup({ save });
    await edit(doc, 500);
    await vi.advanceTimersByTimeAsync(800);
    // Act
    await autosave.resolveConflict('keep');
    await edit(doc, 520);
    await vi.advanceTimersByTimeAsync(5000);
    // Assert: nothing sent while paused
    expect(autosave.status.value).toBe('paused');
    expect(save).toHaveBeenCalledTimes(1);
    expect(autosave.hasUnsavedChanges()).toBe(true);
    // Act: "Save now" tries with the old version and the conflict comes back as a question
    await autosave.flush();
    expect(save).toHaveBeenCalledTimes(2);
    expect(save.mock.calls[1][1]).toBe(3);
    expect(autosave.status.value).toBe('conflict');
    expect(autosave.isConflictOpen.value).toBe(true);
    scope.stop();
  });

  it('when the network fails, then the status says so and the next change tries again', async () => {
    const save = vi
      .fn()
      .mockRejectedValueOnce(new ApiError(0, 'network_error', 'Cannot reach the server.'))
      .mockResolvedValueOnce({ version: 4 });
    const { doc, autosave, scope } = setup({ save });
    await edit(doc, 500);
    await vi.advanceTimersByTimeAsync(800);
    expect(autosave.status.value).toBe('error');
    expect(autosave.lastError.value).toBe('Cannot reach the server.');
    await edit(doc, 501);
    await vi.advanceTimersByTimeAsync(800);
    expect(save).toHaveBeenCalledTimes(2);
    expect(autosave.status.value).toBe('saved');
    scope.stop();
  });
});
