import { describe, expect, it } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { useOpenedOnce } from '@/composables/useOpenedOnce';

describe('useOpenedOnce', () => {
  it('when the dialog opens and closes again, then it counts as opened from the first opening on', async () => {
    // Arrange
    const isOpen = ref(false);
    const scope = effectScope();
    const opened = scope.run(() => useOpenedOnce(isOpen))!;
    const seen = [opened.value];
    // Act
    isOpen.value = true;
    await nextTick();
    seen.push(opened.value);
    isOpen.value = false;
    await nextTick();
    seen.push(opened.value);
    // Assert
    expect(seen).toEqual([false, true, true]);
    scope.stop();
  });

  it('when the dialog is already open at the start, then it counts as opened', () => {
    // Arrange / Act
    const scope = effectScope();
    const opened = scope.run(() => useOpenedOnce(ref(true)))!;
    // Assert
    expect(opened.value).toBe(true);
    scope.stop();
  });
});
