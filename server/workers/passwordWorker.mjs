// Worker thread of the password pool (server/workers/passwordPool.ts). bcrypt costs tens of milliseconds of CPU per
// call by design; run on the event loop, 20 sign-ins at once held every other request up for over a second
// (issue 12, item 5). Plain JavaScript, so a thread started from a test runner or plain node loads it without tsx.
import { threadId } from 'node:worker_threads';
import bcrypt from 'bcryptjs';

/** Hashes a password with bcrypt at `rounds`. */
export function hash({ password, rounds }) {
  return bcrypt.hashSync(password, rounds);
}

/** Compares a password with a bcrypt hash. */
export function compare({ password, hash: stored }) {
  return bcrypt.compareSync(password, stored);
}

/** The id of this thread (tests check the work leaves the main thread). */
export function whereAmI() {
  return threadId;
}
