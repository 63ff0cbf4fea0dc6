import type { DesignResult } from './types';

// A sheet renders the frozen result of its revision, which keeps the shape of the engine that computed it. Engine 1
// results (before the corrected physics) carry other belt and microstep fields; these helpers read them so the sheet
// prints them as approved, labelled with their engine, instead of recomputing anything.

type Belt = DesignResult['belts'][number];

/** Engine 1 belt figures: equal split of the pull between the arms, allowable after the teeth-in-mesh derating. */
export function legacyBelt(b: Belt): { tightSideN: number; slackSideN: number; allowableTensionN: number } | null {
  if (b.tension) return null;
  const old = b as unknown as { tightSideN?: number; slackSideN?: number; allowableTensionN?: number };
  return { tightSideN: old.tightSideN ?? NaN, slackSideN: old.slackSideN ?? NaN, allowableTensionN: old.allowableTensionN ?? NaN };
}

/** Engine 1 microstep figures: one motor's microstep projected on X, Y and the diagonal. */
export function legacyMicrostep(r: DesignResult): { x: number; y: number; diagonal: number } | null {
  if (r.drive.microstep) return null;
  return (r.drive as unknown as { microstepMm?: { x: number; y: number; diagonal: number } }).microstepMm ?? null;
}
