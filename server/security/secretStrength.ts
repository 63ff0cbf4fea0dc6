import fs from 'node:fs';
import path from 'node:path';
import { parseEnv } from 'node:util';
import { ROOT_DIR } from '../paths';

/**
 * Rules for the secrets in `.env` (JWT_SECRET, DB_PASSWORD, DB_OWNER_PASSWORD). They apply in every mode: a token
 * signed with a secret anyone can read (the value shipped in `.env.example`) or guess is a forged session, and a
 * development instance is reachable by whoever can reach its port.
 */

/** Bytes of randomness a session signing secret must carry (HS256 uses a 256-bit key). */
export const SIGNING_SECRET_MIN_BYTES = 32;
/** 32 bytes in base64url (or base64 without padding) is 43 characters. */
export const SIGNING_SECRET_MIN_CHARS = 43;
/** 32 bytes as hex digits. */
export const SIGNING_SECRET_MIN_HEX_CHARS = 64;
/** Fewer different characters than this cannot come from a random generator of that length. */
const MIN_DISTINCT_CHARS = 10;

/** Words that mark a value as something to replace, whatever the rest says. */
const PLACEHOLDER_WORDS = /change[-_ ]?me|placeholder|replace[-_ ]?me|your[-_ ]?secret/i;

let exampleValues: Record<string, string> | undefined;

/** The values `.env.example` ships (public, so never secrets); empty when the file is missing. */
export function exampleEnvValues(file = path.join(ROOT_DIR, '.env.example')): Record<string, string> {
  if (exampleValues === undefined) {
    try {
      exampleValues = parseEnv(fs.readFileSync(file, 'utf8')) as Record<string, string>;
    } catch {
      exampleValues = {};
    }
  }
  return exampleValues;
}

/**
 * True when `value` is a known placeholder: the value `.env.example` ships for any variable, or anything that says
 * "change me" (every placeholder this project has shipped starts with `change-me`).
 */
export function isPlaceholderSecret(value: string): boolean {
  const trimmed = value.trim();
  if (PLACEHOLDER_WORDS.test(trimmed)) return true;
  return Object.values(exampleEnvValues()).some((example) => example !== '' && example === trimmed);
}

/** True when the whole string is one shorter piece repeated ("abcabcabc…"). */
function isRepeatedPattern(value: string): boolean {
  return (value + value).indexOf(value, 1) < value.length;
}

/**
 * Why `value` cannot serve as the session signing secret, or null when it can. The rule: not a placeholder, at least
 * 32 random bytes written out — 43 characters or more (64 when it is only hex digits) — with at least 10 different
 * characters and not one short piece repeated. `openssl rand -base64 32` and
 * `node -e "console.log(require('crypto').randomBytes(32).toString('base64url'))"` both pass.
 */
export function signingSecretProblem(value: string): string | null {
  const howTo = 'use 32 random bytes, e.g. `openssl rand -base64 32` (npm start writes one into .env)';
  if (isPlaceholderSecret(value)) return `is a placeholder from .env.example, which anyone can read; ${howTo}`;
  const isHex = /^[0-9a-fA-F]+$/.test(value);
  const minChars = isHex ? SIGNING_SECRET_MIN_HEX_CHARS : SIGNING_SECRET_MIN_CHARS;
  if (value.length < minChars) {
    return `must carry at least ${SIGNING_SECRET_MIN_BYTES} random bytes: at least ${minChars} characters${isHex ? ' of hex' : ''} (got ${value.length}); ${howTo}`;
  }
  if (new Set(value).size < MIN_DISTINCT_CHARS || isRepeatedPattern(value)) {
    return `does not look random (too few different characters or a repeated pattern); ${howTo}`;
  }
  return null;
}
