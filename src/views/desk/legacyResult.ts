import type { BeltReport, DesignResult } from '@/engine';

// Results frozen in a revision keep the shape of the engine that computed them. Engine 1 results (before the
// corrected physics, docs/README.md) lack some fields and carry others; the result tabs show them as approved,
// labelled with their engine, and never recompute them.

/** Belt figures of an engine 1 result, which split each pull equally between the arms. */
export interface LegacyBeltFigures {
  tightSideN: number;
  slackSideN: number;
  /** The allowable after the old teeth-in-mesh derating. */
  allowableTensionN: number;
}

/**
 * The one-motor-projected microstep figures of an engine 1 result, or null for a current result.
 * @param result - an engine result
 * @returns {x, y, diagonal} [mm] or null
 */
export function legacyMicrostepMm(result: DesignResult): { x: number; y: number; diagonal: number } | null {
  if (result.drive.microstep) return null;
  const old = (result.drive as unknown as { microstepMm?: { x: number; y: number; diagonal: number } }).microstepMm;
  return old ?? null;
}

/**
 * The tight/slack figures of an engine 1 belt, or null for a belt of a current result.
 * @param belt - one belt of an engine result
 * @returns the old figures [N] or null
 */
export function legacyBeltFigures(belt: BeltReport): LegacyBeltFigures | null {
  if (belt.tension) return null;
  const old = belt as unknown as Partial<LegacyBeltFigures>;
  return typeof old.tightSideN === 'number' && typeof old.slackSideN === 'number'
    ? { tightSideN: old.tightSideN, slackSideN: old.slackSideN, allowableTensionN: old.allowableTensionN ?? NaN }
    : null;
}
