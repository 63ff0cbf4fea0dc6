import { onBeforeUnmount, ref, shallowRef, watch, type Ref, type ShallowRef } from 'vue';
import { isApiError } from '@/api/http';
import {
  getMeasurement,
  listMeasurements,
  recordPluckRecording,
  recordTypedMeasurement,
  type MeasurementDetail,
  type SheetMeasurements,
} from '@/api/measurements';
import { errorMessage } from '@/utils/message';

/** What the maker sends: a typed frequency, or a recording of the pluck. */
export type MeasurementEntry = { spanId: string } & ({ mode: 'typed'; frequencyHz: number } | { mode: 'recording'; file: File });

/** State and actions of a sheet's Measurements section. */
export interface UseSheetMeasurements {
  /** The list with its per-span summary (null until loaded). */
  data: ShallowRef<SheetMeasurements | null>;
  isLoading: Ref<boolean>;
  loadError: Ref<string>;
  isSaving: Ref<boolean>;
  /** The API's message for the last failed recording (shown beside the form). */
  saveError: Ref<string>;
  /** The measurement just recorded or picked from the list, with its spectrum. */
  shown: ShallowRef<MeasurementDetail | null>;
  load: () => Promise<void>;
  record: (entry: MeasurementEntry) => Promise<boolean>;
  show: (measurementId: number) => Promise<void>;
}

/**
 * Loads a sheet's belt tension measurements and records new ones (typed or a WAV recording). After a recording the
 * list is reloaded so the span summary and the crossed-belt comparison follow.
 * @param sheetId - the sheet (reactive)
 */
export function useSheetMeasurements(sheetId: Ref<number>): UseSheetMeasurements {
  const data = shallowRef<SheetMeasurements | null>(null);
  const isLoading = ref(false);
  const loadError = ref('');
  const isSaving = ref(false);
  const saveError = ref('');
  const shown = shallowRef<MeasurementDetail | null>(null);
  let ticket = 0;
  let isActive = true;

  async function load(): Promise<void> {
    const mine = ++ticket;
    isLoading.value = true;
    loadError.value = '';
    try {
      const result = await listMeasurements(sheetId.value);
      if (mine !== ticket || !isActive) return;
      data.value = result;
      // Open the newest recording (with its spectrum), or else the newest measurement, when nothing is shown yet.
      const first = result.items.find((m) => m.hasSpectrum) ?? result.items[0];
      if (!shown.value && first) void show(first.id);
    } catch (err) {
      if (mine === ticket && isActive) loadError.value = errorMessage(err, 'The measurements could not be loaded.');
    } finally {
      if (mine === ticket) isLoading.value = false;
    }
  }

  async function record(entry: MeasurementEntry): Promise<boolean> {
    isSaving.value = true;
    saveError.value = '';
    try {
      const saved =
        entry.mode === 'typed'
          ? await recordTypedMeasurement(sheetId.value, entry.spanId, entry.frequencyHz)
          : await recordPluckRecording(sheetId.value, entry.spanId, entry.file);
      shown.value = saved;
      await load();
      return true;
    } catch (err) {
      // The server's message is written for the maker (e.g. "No clear tone found — pluck closer to the microphone.").
      saveError.value = isApiError(err) ? err.message : errorMessage(err);
      return false;
    } finally {
      isSaving.value = false;
    }
  }

  async function show(measurementId: number): Promise<void> {
    try {
      shown.value = await getMeasurement(sheetId.value, measurementId);
    } catch (err) {
      saveError.value = errorMessage(err, 'That measurement could not be opened.');
    }
  }

  watch(
    sheetId,
    () => {
      shown.value = null;
      void load();
    },
    { immediate: true },
  );
  onBeforeUnmount(() => {
    isActive = false;
  });

  return { data, isLoading, loadError, isSaving, saveError, shown, load, record, show };
}
