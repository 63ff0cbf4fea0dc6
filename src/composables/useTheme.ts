import { readonly, ref, type Ref } from 'vue';

/** localStorage key; public/theme-init.js reads the same key before the first paint. */
export const THEME_STORAGE_KEY = 'gw-theme';

/** The two colour themes. */
export type ThemeName = 'light' | 'dark';

function readSaved(): ThemeName | null {
  try {
    const saved = localStorage.getItem(THEME_STORAGE_KEY);
    return saved === 'dark' || saved === 'light' ? saved : null;
  } catch {
    return null; // storage may be blocked; fall back to the system preference
  }
}

function systemPrefersDark(): boolean {
  return (
    typeof window !== 'undefined' && typeof window.matchMedia === 'function' && window.matchMedia('(prefers-color-scheme: dark)').matches
  );
}

function apply(dark: boolean): void {
  if (typeof document === 'undefined') return;
  document.documentElement.classList.toggle('dark', dark);
  document.documentElement.style.colorScheme = dark ? 'dark' : 'light';
}

// One theme per page: the state is shared by every caller of useTheme().
const isDarkState = ref(false);
let isInitialised = false;

function init(): void {
  if (isInitialised) return;
  isInitialised = true;
  const saved = readSaved();
  isDarkState.value = saved ? saved === 'dark' : systemPrefersDark();
  apply(isDarkState.value);
}

/**
 * The colour theme: light or dark, from the saved choice or else the system preference.
 * Toggling saves the choice in localStorage and switches Element Plus' variables through the `dark`
 * class on `<html>`.
 * @returns `isDark` (read-only ref), `toggle()` and `setTheme(name)`
 */
export function useTheme(): { isDark: Readonly<Ref<boolean>>; toggle: () => void; setTheme: (name: ThemeName) => void } {
  init();

  function setTheme(name: ThemeName): void {
    isDarkState.value = name === 'dark';
    apply(isDarkState.value);
    try {
      localStorage.setItem(THEME_STORAGE_KEY, name);
    } catch {
      /* not persisted when storage is blocked; the choice still applies to this page */
    }
  }

  function toggle(): void {
    setTheme(isDarkState.value ? 'light' : 'dark');
  }

  return { isDark: readonly(isDarkState), toggle, setTheme };
}
