/**
 * Dotted field paths ("pulley.driveTeeth") into a design document: the one reader and writer used by the engine's
 * sweep, the API's sweep check, the worker and the Design desk form.
 */

/** Keys a path may never write: they would reach an object's prototype instead of one of its fields. */
const FORBIDDEN_KEYS = new Set(['__proto__', 'prototype', 'constructor']);

/**
 * Reads the value at a dotted path of a nested object.
 * @param source - object to read
 * @param path - dotted path, e.g. "belt.pitchMm"
 * @returns the value, or undefined when any step is missing or not an object
 */
export function getAt(source: unknown, path: string): unknown {
  let node: unknown = source;
  for (const key of path.split('.')) {
    if (typeof node !== 'object' || node === null) return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

/**
 * Writes a value at a dotted path in place, creating groups on the way where a step is missing or not an object
 * (in place, so a Vue reactive object reports the change; copy first to keep the source).
 * @param target - object to change
 * @param path - dotted path, e.g. "pulley.driveTeeth"
 * @param value - the new value
 * @throws Error when a step of the path is a prototype key (`__proto__`, `prototype`, `constructor`)
 */
export function setAt(target: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  if (keys.some((k) => FORBIDDEN_KEYS.has(k))) throw new Error(`"${path}" is not a field path`);
  let node: Record<string, unknown> = target;
  for (const key of keys.slice(0, -1)) {
    if (typeof node[key] !== 'object' || node[key] === null) node[key] = {};
    node = node[key] as Record<string, unknown>;
  }
  node[keys[keys.length - 1]] = value;
}

/**
 * The first step of a dotted path that exists but holds something other than a group of fields (a number, a text,
 * null, a list): a value cannot be set beneath it without replacing it.
 * @param source - object to look into
 * @param path - dotted path
 * @returns the dotted prefix that is not a group, or null when every step above the last is a group or missing
 */
export function nonGroupStep(source: unknown, path: string): string | null {
  const keys = path.split('.');
  let node: unknown = source;
  for (let i = 0; i < keys.length - 1; i++) {
    node = (node as Record<string, unknown>)[keys[i]];
    if (node === undefined) return null;
    if (node === null || typeof node !== 'object' || Array.isArray(node)) return keys.slice(0, i + 1).join('.');
  }
  return null;
}
