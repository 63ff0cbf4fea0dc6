import type { Mechanism } from '@/engine';

/**
 * Mechanism names for people. Kept apart from fields.ts (which needs the engine) so that list pages can name a
 * mechanism without loading the engine.
 */

/** Mechanism labels used across the Design desk and the designs list. */
export const MECHANISM_LABELS: Record<Mechanism, string> = {
  corexy: 'CoreXY — crossed belts',
  hbot: 'H-bot — one H-shaped belt',
  cartesian: 'Cartesian — one motor per axis',
};

/** Short mechanism names for tables and tags. */
export const MECHANISM_SHORT: Record<Mechanism, string> = { corexy: 'CoreXY', hbot: 'H-bot', cartesian: 'Cartesian' };
