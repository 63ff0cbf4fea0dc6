// Apply the saved (or system) colour theme before the first paint so the page does not flash.
// A file rather than an inline script so the server's Content-Security-Policy can stay strict.
// Kept in sync with src/composables/useTheme.ts (same storage key and class name).
(function () {
  try {
    var saved = localStorage.getItem('gw-theme');
    var dark = saved ? saved === 'dark' : window.matchMedia('(prefers-color-scheme: dark)').matches;
    if (dark) document.documentElement.classList.add('dark');
  } catch (e) {
    /* storage blocked: keep the light theme */
  }
})();
