/**
 * Version of the calculation engine. Bumped whenever any computed number can change, so a stored
 * revision's results can be told apart from a recomputation by a newer engine.
 */
export const ENGINE_VERSION = '2.2.0';
