import { ref, watch } from 'vue';
import { defineStore } from 'pinia';
import { UNIT_SYSTEMS, type UnitSystem } from '@/format';

/** localStorage key of the chosen unit system. */
export const UNITS_STORAGE_KEY = 'gw.units';

function readSaved(): UnitSystem {
  try {
    const saved = globalThis.localStorage?.getItem(UNITS_STORAGE_KEY);
    return (UNIT_SYSTEMS as readonly string[]).includes(saved ?? '') ? (saved as UnitSystem) : 'metric';
  } catch {
    return 'metric'; // storage blocked (private mode, sandboxed frame)
  }
}

/**
 * The unit system the person reads and types in (metric or imperial). Only the display changes: designs
 * keep lengths in mm and everything else in SI. The choice is kept in localStorage, per browser.
 */
export const useUnitsStore = defineStore('units', () => {
  /** The chosen system. */
  const system = ref<UnitSystem>(readSaved());

  watch(system, (value) => {
    try {
      globalThis.localStorage?.setItem(UNITS_STORAGE_KEY, value);
    } catch {
      // not persisted; the choice still holds for this page
    }
  });

  /**
   * Picks a unit system.
   * @param value - metric or imperial
   */
  function setSystem(value: UnitSystem): void {
    system.value = value;
  }

  /** Switches between metric and imperial. */
  function toggle(): void {
    system.value = system.value === 'metric' ? 'imperial' : 'metric';
  }

  return { system, setSystem, toggle };
});
