import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick } from 'vue';
import { flushPromises, mount } from '@vue/test-utils';
import { usePagedList, type PageAnswer, type PagedList } from '@/composables/usePagedList';

/** A fetch whose answers the test releases by hand, in any order. */
function controlledFetch() {
  const calls: { page: number; resolve: (a: PageAnswer<string>) => void; reject: (e: unknown) => void }[] = [];
  const fetchPage = (page: number) =>
    new Promise<PageAnswer<string>>((resolve, reject) => {
      calls.push({ page, resolve, reject });
    });
  return { calls, fetchPage };
}

function mountList(fetchPage: (page: number) => Promise<PageAnswer<string>>): PagedList<string> {
  let list!: PagedList<string>;
  mount(
    defineComponent({
      setup: () => {
        list = usePagedList(fetchPage, 'The list could not be loaded.');
        return () => h('div');
      },
    }),
  );
  return list;
}

describe('usePagedList', () => {
  it('when mounted, then loads page 1 and shows its rows and total', async () => {
    // Arrange
    const { calls, fetchPage } = controlledFetch();
    const list = mountList(fetchPage);
    // Act
    await nextTick();
    calls[0].resolve({ items: ['a', 'b'], total: 7 });
    await flushPromises();
    // Assert
    expect(calls.map((c) => c.page)).toEqual([1]);
    expect(list.rows.value).toEqual(['a', 'b']);
    expect(list.total.value).toBe(7);
    expect(list.isLoading.value).toBe(false);
    expect(list.hasLoaded.value).toBe(true);
  });

  it('when an older page answers after a newer one, then the older answer is ignored', async () => {
    // Arrange
    const { calls, fetchPage } = controlledFetch();
    const list = mountList(fetchPage);
    await nextTick();
    // Act: move to page 2 while page 1 is still on its way, then let page 2 answer first.
    list.page.value = 2;
    await nextTick();
    calls[1].resolve({ items: ['page 2'], total: 30 });
    await flushPromises();
    calls[0].resolve({ items: ['page 1'], total: 30 });
    await flushPromises();
    // Assert
    expect(calls.map((c) => c.page)).toEqual([1, 2]);
    expect(list.rows.value).toEqual(['page 2']);
  });

  it('when loading fails, then the error message is kept and the rows stay as they were', async () => {
    // Arrange
    const { calls, fetchPage } = controlledFetch();
    const list = mountList(fetchPage);
    await nextTick();
    // Act
    calls[0].reject(new Error('Server unreachable'));
    await flushPromises();
    // Assert
    expect(list.loadError.value).toBe('Server unreachable');
    expect(list.rows.value).toEqual([]);
    expect(list.isLoading.value).toBe(false);
  });
});
