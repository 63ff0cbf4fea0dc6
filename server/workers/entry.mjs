// Entry file of the server's worker threads (piscina loads it once per thread).
//
// The server runs TypeScript through tsx without a build step, but a worker thread does not get the parent's tsx
// loader: on Node 20, hooks registered with --import (how `tsx` and `node --import tsx` work) apply to the thread
// that registered them, and a thread started by a test runner never had them. So this entry is plain JavaScript:
// it loads the TypeScript tasks, and when this thread cannot load TypeScript yet, it registers tsx for itself
// first (tsx/esm/api) and tries again. tsx also reads tsconfig `paths`, so the tasks import the engine as `@/engine`.
import fs from 'node:fs';
import os from 'node:os';
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

// This thread runs at a lower priority than the event loop (WORKER_NICE, server/config.ts), so /api/health, sign-ins
// and lists get a core first while the engine or a sheet keeps the others busy. On Linux a thread is a task with its
// own id and nice value: /proc/thread-self names it, and setpriority() on that id changes this thread only. Elsewhere
// (or without /proc) the threads keep the process's priority.
function lowerThreadPriority(nice) {
  if (!nice || process.platform !== 'linux') return;
  try {
    const tid = Number(fs.readlinkSync('/proc/thread-self').split('/').pop());
    if (Number.isSafeInteger(tid) && tid > 0) os.setPriority(tid, nice);
  } catch {
    // No /proc, or not allowed: run at the process's priority.
  }
}
lowerThreadPriority(workerData?.nice);

async function loadTasks() {
  try {
    return await import('./tasks.ts');
  } catch (err) {
    if (err?.code !== 'ERR_UNKNOWN_FILE_EXTENSION') throw err;
    register();
    // A new URL: the failed attempt stays cached under the plain one.
    return await import('./tasks.ts?with-tsx');
  }
}

const tasks = await loadTasks();

/** Named tasks: `pool.run(arg, { name })`. */
export const calc = tasks.calc;
export const freeze = tasks.freeze;
export const storedResults = tasks.storedResults;
export const renderSheets = tasks.renderSheets;
export const ping = tasks.ping;
