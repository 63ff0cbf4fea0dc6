import { computed, ref, shallowRef, watch, type Ref } from 'vue';
import type { DesignStatus } from '@/api/designs';
import type { UnitSystem } from '@/format';
import { listDesignRevisions, reopenDesign, submitDesign, withdrawDesign, type RevisionListItem } from '@/api/revisions';
import { showError, showSuccess } from '@/utils/message';

/**
 * The review side of one design, for its Design desk: its revision history (with the latest return reason),
 * and submit / withdraw / reopen. The server enforces who may do what; `canChange` only decides what to offer.
 * @param designId - the design
 * @param status - the design's current status (the caller reloads the design after `changed`)
 */
export function useDesignReview(designId: Ref<number>, status: Ref<DesignStatus | undefined>) {
  const revisions = shallowRef<RevisionListItem[]>([]);
  const isBusy = ref(false);
  const loadError = ref<string | null>(null);

  /** The newest revision, if any. */
  const latest = computed(() => revisions.value[0] ?? null);
  /** The reason of the latest return, while the design is returned (or a draft again after it). */
  const returned = computed(() => {
    const last = latest.value;
    return last && last.status === 'returned' && (status.value === 'returned' || status.value === 'draft') ? last : null;
  });

  /** (Re)loads the revision history. */
  async function load(): Promise<void> {
    try {
      revisions.value = (await listDesignRevisions(designId.value)).items;
      loadError.value = null;
    } catch (err) {
      loadError.value = err instanceof Error ? err.message : 'The revision history could not be loaded.';
    }
  }

  async function run(action: () => Promise<unknown>, success: string, failure: string): Promise<boolean> {
    isBusy.value = true;
    try {
      await action();
      showSuccess(success);
      await load();
      return true;
    } catch (err) {
      showError(err, failure);
      return false;
    } finally {
      isBusy.value = false;
    }
  }

  /**
   * Freezes the stored inputs as a new revision and sends it for review.
   * @param version - the design version the designer sees (the server refuses a stale one)
   * @param sheetUnits - unit system the design sheet will be printed in
   */
  const submit = (version?: number, sheetUnits?: UnitSystem) =>
    run(
      () => submitDesign(designId.value, version, sheetUnits),
      'Submitted for review. Reviewers have been notified.',
      'The design could not be submitted.',
    );
  /** Takes the revision in review back; the design becomes a draft again. */
  const withdraw = () =>
    run(() => withdrawDesign(designId.value), 'Withdrawn. The design is a draft again.', 'The design could not be withdrawn.');
  /** Reopens an approved design as a draft for a new revision. */
  const reopen = () =>
    run(
      () => reopenDesign(designId.value),
      'Reopened as a draft. The approved sheet stays available.',
      'The design could not be reopened.',
    );

  watch([designId, status], () => void load(), { immediate: true });

  return { revisions, latest, returned, isBusy, loadError, load, submit, withdraw, reopen };
}
