import { onScopeDispose, ref, type Ref } from 'vue';

/**
 * Whether a CSS media query matches, kept up to date while the calling component lives.
 * Used where layout needs more than CSS (e.g. which table columns to render on a tablet).
 * @param query - a media query, e.g. `(max-width: 1100px)`
 * @returns `matches`, a read-only boolean ref
 */
export function useMediaQuery(query: string): { matches: Readonly<Ref<boolean>> } {
  const matches = ref(false);
  if (typeof window === 'undefined' || typeof window.matchMedia !== 'function') return { matches };
  const list = window.matchMedia(query);
  matches.value = list.matches;
  const onChange = (event: MediaQueryListEvent): void => {
    matches.value = event.matches;
  };
  list.addEventListener('change', onChange);
  onScopeDispose(() => list.removeEventListener('change', onChange));
  return { matches };
}
