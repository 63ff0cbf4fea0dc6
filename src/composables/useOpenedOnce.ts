import { ref, watch, type Ref } from 'vue';

/**
 * For a dialog that loads on first use: true from the first time `isOpen` turns true, and kept, so the dialog is
 * mounted (`v-if`) only once someone opens it and then stays mounted to play its closing animation. It is mounted
 * already open, so its own "when opened" watch must run immediately too.
 * @param isOpen - the dialog's v-model
 * @returns whether the dialog has been opened at least once
 */
export function useOpenedOnce(isOpen: Ref<boolean>): Readonly<Ref<boolean>> {
  const opened = ref(isOpen.value);
  watch(isOpen, (open) => {
    if (open) opened.value = true;
  });
  return opened;
}
