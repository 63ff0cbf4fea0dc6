// Entry file of the server's worker threads (piscina loads it once per thread).
//
// The server runs TypeScript through tsx without a build step. A thread started from `tsx server/index.ts`
// inherits tsx's loader through process.execArgv, but one started from a test runner (vitest) or plain node does
// not, so this entry is plain JavaScript: it registers tsx for its own thread when needed, then loads the
// TypeScript task modules. tsx also reads tsconfig `paths`, so the tasks import the engine as `@/engine`.
import { register } from 'tsx/esm/api';

const hasTsx = process.execArgv.some((arg) => arg.includes('tsx'));
if (!hasTsx) register();

const tasks = await import('./tasks.ts');

/** Named tasks: `pool.run(arg, { name })`. */
export const calc = tasks.calc;
export const freeze = tasks.freeze;
export const storedResults = tasks.storedResults;
export const renderSheets = tasks.renderSheets;
export const ping = tasks.ping;
