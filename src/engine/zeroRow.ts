// Grid maps are plain number[][] in the result. A row made with `new Array(n)` starts as an array of small integers
// and is copied into a new store when its first fractional value arrives; a copy of a row that already holds
// doubles never changes kind, and copying it is a single block copy. This file only builds such a row.

/**
 * A row of `n` zeros stored as doubles, to be copied (`row.slice()`) for every row of a grid map.
 * @param n - row length (grid columns)
 * @returns an array of n zeros whose elements are doubles
 */
export function zeroRow(n: number): number[] {
  // Filling with a fraction first makes the store a double store; zeros written into it stay doubles.
  return new Array<number>(n).fill(0.5).fill(0);
}
