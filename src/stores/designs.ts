import { ref } from 'vue';
import { defineStore } from 'pinia';
import type { DesignListQuery, DesignSortKey, DesignStatus } from '@/api/designs';
import type { Mechanism } from '@/engine';

/** Rows per page choices of the Designs table. */
export const DESIGN_PAGE_SIZES = [10, 20, 50] as const;

/**
 * How the Designs table is filtered, sorted and paged. Kept in a store so that coming back from the Design desk
 * shows the same page, search and filters.
 */
export const useDesignsStore = defineStore('designs', () => {
  const page = ref(1);
  const pageSize = ref<number>(20);
  /** Column and direction; the API takes "-updatedAt" for descending. */
  const sortKey = ref<DesignSortKey>('updatedAt');
  const sortOrder = ref<'ascending' | 'descending'>('descending');
  const q = ref('');
  const status = ref<DesignStatus | ''>('');
  const mechanism = ref<Mechanism | ''>('');

  /** The query for GET /api/designs. */
  function toQuery(): DesignListQuery {
    return {
      page: page.value,
      pageSize: pageSize.value,
      sort: `${sortOrder.value === 'descending' ? '-' : ''}${sortKey.value}`,
      q: q.value.trim() || undefined,
      status: status.value || undefined,
      mechanism: mechanism.value || undefined,
    };
  }

  /** Whether any filter or search narrows the list. */
  function isFiltered(): boolean {
    return q.value.trim() !== '' || status.value !== '' || mechanism.value !== '';
  }

  /** Clears search and filters and goes back to the first page. */
  function clearFilters(): void {
    q.value = '';
    status.value = '';
    mechanism.value = '';
    page.value = 1;
  }

  return { page, pageSize, sortKey, sortOrder, q, status, mechanism, toQuery, isFiltered, clearFilters };
});
