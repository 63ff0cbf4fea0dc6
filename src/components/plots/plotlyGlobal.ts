// plotly.js' sources still name Node's `global` in a few places; in the browser that is globalThis. This module is
// imported before plotly.js (module evaluation follows import order), so the name exists when plotly.js runs.
(globalThis as { global?: unknown }).global ??= globalThis;

export {};
