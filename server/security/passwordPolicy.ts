import { createRequire } from 'node:module';

/**
 * The password policy, applied whenever a password is set through the app (reset and invitation links; issue 12,
 * item 6). Passwords stored before it — the demo seed's `gantry-demo` — keep working; the policy is not checked at
 * sign-in.
 *  - at least {@link PASSWORD_MIN_LENGTH} characters;
 *  - at most {@link PASSWORD_MAX_BYTES} bytes in UTF-8: bcrypt reads no further, so a longer one would silently
 *    count only in part — refused with a clear message rather than pre-hashed, so stored hashes stay plain bcrypt;
 *  - not on the list of common passwords shipped with the app (the ~49,000 passwords most often found in published
 *    leaks, from the `@zxcvbn-ts/language-common` package), also not with digits and signs stuck on either end
 *    ("Password2024!" is "password");
 *  - at least {@link MIN_DISTINCT_CHARACTERS} different characters;
 *  - not containing the account's e-mail address, its part before the @, its name, or a word of either (checked by
 *    {@link personalPasswordProblems} once the account is known).
 */

/** Shortest password accepted. */
export const PASSWORD_MIN_LENGTH = 12;
/** Longest password accepted, in UTF-8 bytes (bcrypt's limit). */
export const PASSWORD_MAX_BYTES = 72;
/** Fewest different characters ("aaaaaaaaaaaa" is twelve characters but one guess). */
export const MIN_DISTINCT_CHARACTERS = 5;
/** Parts of a name or e-mail shorter than this are not looked for (initials would refuse half of all passwords). */
const MIN_PERSONAL_PART = 4;

const require = createRequire(import.meta.url);
let commonPasswords: Set<string> | undefined;

/** The shipped list, loaded on first use (it takes a few milliseconds to unpack). */
function isCommon(candidate: string): boolean {
  commonPasswords ??= new Set(
    (require('@zxcvbn-ts/language-common') as { dictionary: Record<string, string[]> }).dictionary['passwords-common'],
  );
  return commonPasswords.has(candidate);
}

/** "Password2024!" → "password": lower case, without digits, signs and spaces at either end. */
function core(password: string): string {
  return password.toLowerCase().replace(/^[\d\W_]+|[\d\W_]+$/gu, '');
}

/** What is wrong with a new password on its own (without knowing whose it is); empty when nothing. */
export function passwordProblems(password: string): string[] {
  const problems: string[] = [];
  if ([...password].length < PASSWORD_MIN_LENGTH) problems.push(`must be at least ${PASSWORD_MIN_LENGTH} characters`);
  if (Buffer.byteLength(password, 'utf8') > PASSWORD_MAX_BYTES) {
    problems.push(`must be at most ${PASSWORD_MAX_BYTES} bytes (bcrypt reads no further); use fewer or plainer characters`);
  }
  if (problems.length) return problems;
  const lower = password.toLowerCase();
  const stripped = core(password);
  if (isCommon(lower) || (stripped.length >= MIN_PERSONAL_PART && isCommon(stripped))) {
    problems.push('is one of the most common passwords; choose another (a short sentence of your own works well)');
  } else if (new Set(password).size < MIN_DISTINCT_CHARACTERS) {
    problems.push(`must use at least ${MIN_DISTINCT_CHARACTERS} different characters`);
  }
  return problems;
}

/** Letters and digits only, lower case: "Ada O'Neil" → "adaoneil". */
const squash = (text: string) => text.toLowerCase().replace(/[^\p{L}\p{N}]+/gu, '');

/**
 * What is wrong with a new password for this account: it must not contain the account's e-mail address, the part
 * before the @, its name, or a word of either (parts shorter than 4 letters are not looked for).
 */
export function personalPasswordProblems(password: string, person: { email: string; name: string }): string[] {
  const text = squash(password);
  const local = person.email.split('@')[0] ?? '';
  const emailParts = [squash(person.email), squash(local), ...local.split(/[^\p{L}\p{N}]+/u).map(squash)];
  const nameParts = [squash(person.name), ...person.name.split(/\s+/).map(squash)];
  const problems: string[] = [];
  if (emailParts.some((p) => p.length >= MIN_PERSONAL_PART && text.includes(p))) problems.push('must not contain your e-mail address');
  if (nameParts.some((p) => p.length >= MIN_PERSONAL_PART && text.includes(p))) problems.push('must not contain your name');
  return problems;
}
