/**
 * Reads the value at a dotted path ("belt.pitchMm") of a nested object.
 * @param source - object to read
 * @param path - dotted path
 * @returns the value, or undefined when any step is missing
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
 * Writes a value at a dotted path, creating objects on the way (the object is changed in place, so a Vue
 * reactive object reports the change).
 * @param target - object to change
 * @param path - dotted path
 * @param value - the new value
 */
export function setAt(target: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  let node: Record<string, unknown> = target;
  for (const key of keys.slice(0, -1)) {
    if (typeof node[key] !== 'object' || node[key] === null) node[key] = {};
    node = node[key] as Record<string, unknown>;
  }
  node[keys[keys.length - 1]] = value;
}
