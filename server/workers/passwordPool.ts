import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';

/**
 * A small worker-thread pool (piscina) for bcrypt, separate from the engine and PDF pools: hashing and checking
 * passwords never runs on the event loop, so a burst of sign-ins (or of guesses) does not stall every other request.
 * Idle threads are unref'd by piscina and end after a while, so scripts that hash a password still exit.
 */
const WORKER = path.join(path.dirname(fileURLToPath(import.meta.url)), 'passwordWorker.mjs');

let pool: Piscina | null = null;

function getPool(): Piscina {
  pool ??= new Piscina({
    filename: WORKER,
    minThreads: 0,
    // One core stays for the event loop; bcrypt's cost bounds how many sign-ins a second the server can check anyway.
    maxThreads: Math.max(1, Math.min(2, os.availableParallelism() - 1)),
    idleTimeout: 30_000,
    maxQueue: Infinity,
  });
  return pool;
}

/** bcrypt hash of `password` at `rounds`, computed in the pool. */
export async function hashInPool(password: string, rounds: number): Promise<string> {
  return (await getPool().run({ password, rounds }, { name: 'hash' })) as string;
}

/** Whether `password` matches the bcrypt `hash`, checked in the pool. */
export async function compareInPool(password: string, hash: string): Promise<boolean> {
  return (await getPool().run({ password, hash }, { name: 'compare' })) as boolean;
}

/** The thread id a pool task runs on (for the test that bcrypt leaves the main thread). */
export async function passwordPoolThreadId(): Promise<number> {
  return (await getPool().run(null, { name: 'whereAmI' })) as number;
}

/** Stops the pool (server shutdown, end of scripts). */
export async function closePasswordPool(): Promise<void> {
  const current = pool;
  pool = null;
  await current?.close({ force: true });
}
