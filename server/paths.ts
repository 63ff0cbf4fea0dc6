import { fileURLToPath } from 'node:url';
import path from 'node:path';

/** Absolute path of the repository root (the folder holding package.json). */
export const ROOT_DIR = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** Absolute path of the built client (`vite build` output). */
export const DIST_DIR = path.join(ROOT_DIR, 'dist');

/** Resolves a possibly relative path against the repository root, so the cwd never matters. */
export function resolveFromRoot(p: string): string {
  return path.isAbsolute(p) ? p : path.join(ROOT_DIR, p);
}
