/**
 * A pid lock file so two `npm start` (or two `npm test`) runs in the same folder cannot trample each
 * other: the second would otherwise reuse, and on exit stop, the first one's MariaDB, or wipe its test data.
 */
import fs from 'node:fs';
import path from 'node:path';

function holder(file: string): number | null {
  try {
    const pid = Number(fs.readFileSync(file, 'utf8').trim());
    if (!Number.isInteger(pid) || pid <= 0 || pid === process.pid) return null;
    process.kill(pid, 0);
    return pid;
  } catch {
    return null;
  }
}

/**
 * Takes the lock `file` for this process, released automatically on exit.
 * @throws Error naming the pid of a live process that holds it.
 */
export function acquireRunLock(file: string, what: string): () => void {
  const pid = holder(file);
  if (pid !== null) {
    throw new Error(`${what} is already running in this folder (pid ${pid}). Stop it first, or wait for it to finish.`);
  }
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, `${process.pid}\n`);
  const release = () => {
    try {
      if (fs.readFileSync(file, 'utf8').trim() === String(process.pid)) fs.unlinkSync(file);
    } catch {
      // already gone
    }
  };
  process.once('exit', release);
  return release;
}
