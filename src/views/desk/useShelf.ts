import { onMounted, ref, shallowRef } from 'vue';
import { listParts } from '@/api/parts';
import { errorMessage } from '@/utils/message';
import type { Shelf } from './shelfMatch';

/**
 * The Parts shelf as the Design desk offers it: every belt, pulley and motor, retired ones included (shown but not
 * offered) so an old design still names the part it was built from.
 * @returns `shelf` (null until loaded), `error`, `load()`
 */
export function useShelf() {
  const shelf = shallowRef<Shelf | null>(null);
  const error = ref<string | null>(null);

  async function load(): Promise<void> {
    try {
      const [belts, pulleys, motors] = await Promise.all([listParts('belts', true), listParts('pulleys', true), listParts('motors', true)]);
      shelf.value = { belts, pulleys, motors };
      error.value = null;
    } catch (err) {
      error.value = errorMessage(err, 'The Parts shelf could not be loaded; type the values instead.');
    }
  }

  onMounted(() => void load());
  return { shelf, error, load };
}
