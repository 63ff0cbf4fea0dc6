/**
 * Builds the Vue client into dist/ with Vite when the build is missing or older than its sources.
 * Used by `npm start` and by the e2e test setup.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { ROOT_DIR, DIST_DIR } from '../server/paths';

/** Files and folders whose changes make dist/ stale. */
const CLIENT_SOURCES = ['src', 'public', 'index.html', 'vite.config.ts', 'tsconfig.json', 'package-lock.json'];

function newestMtime(target: string): number {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(target);
  } catch {
    return 0;
  }
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) newest = Math.max(newest, newestMtime(path.join(target, entry)));
  return newest;
}

/** Why dist/ needs a rebuild, or null when it is up to date. */
export function clientBuildStaleReason(): string | null {
  const builtIndex = path.join(DIST_DIR, 'index.html');
  if (!fs.existsSync(builtIndex)) return 'no build in dist/ yet';
  const builtAt = fs.statSync(builtIndex).mtimeMs;
  const sourcesAt = Math.max(...CLIENT_SOURCES.map((p) => newestMtime(path.join(ROOT_DIR, p))));
  return sourcesAt > builtAt ? 'sources changed since the last build' : null;
}

/** Runs `vite build` in a child process (its output goes to ours). */
export function buildClient(): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [path.join(ROOT_DIR, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'], {
      cwd: ROOT_DIR,
      stdio: ['ignore', 'inherit', 'inherit'],
      env: { ...process.env, NODE_ENV: 'production' },
    });
    child.on('error', reject);
    child.on('exit', (code, signal) => (code === 0 ? resolve() : reject(new Error(`vite build failed (exit ${code ?? signal}).`))));
  });
}

/** Builds the client when dist/ is missing or stale. @returns whether it built. */
export async function buildClientIfStale(log: (line: string) => void = (l) => process.stdout.write(`${l}\n`)): Promise<boolean> {
  const reason = clientBuildStaleReason();
  if (!reason) return false;
  log(`Building the client (${reason})...`);
  await buildClient();
  return true;
}
