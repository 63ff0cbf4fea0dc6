import { requireNumber } from './errors';
import type { BeltLayout } from './beltLayout';

/**
 * Spacing S of the belt turns at the two gantry ends that carry the carriage's X pull into the side runs.
 * Only the H layout has a moment arm; for the other layouts 0 is returned.
 * @param layout - belt layout
 * @returns turn spacing [mm]
 */
export function rackingTurnSpacingMm(layout: BeltLayout): number {
  if (layout.mechanism !== 'hbot') return 0;
  const els = layout.loops[0].elements;
  const right = els.find((e) => e.id === 'H.gantryRightFront');
  const left = els.find((e) => e.id === 'H.gantryLeftFront');
  if (!right || !left) return 0;
  // Each front gantry idler turns the belt a quarter turn; its side run leaves at centre ± radius.
  return right.baseXMm + right.radiusMm - (left.baseXMm - left.radiusMm);
}

/**
 * Gantry racking moment per newton of X belt pull. Free body of the gantry with the carriage: in the H layout
 * the carriage is held by the piece to the right end (tension T₁) and the piece to the left end (T₃), so
 * Fx = T₁ − T₃. At the ends these pieces turn into the side runs and pull the gantry toward the front at
 * x = ±S/2, while the run between the motors pulls both ends equally toward the back. The moment about the
 * gantry centre is M = (S/2)·(T₃ − T₁), |M| = Fx·S/2. With two mirror-image crossed loops each loop's two
 * side runs carry 2·T₀ together, and the loops' moments cancel; a cartesian stage drives the gantry at both
 * ends through equal Y belts, so neither has a moment.
 * @param args.mechanism - mechanism key
 * @param args.turnSpacingMm - spacing S of the belt turns at the gantry ends [mm]
 * @returns moment per newton of X pull [N·m/N = m]
 * @see docs/models/racking.md; Hackaday, "Design Analysis: Core XY vs H-Bot" (29 Feb 2016): the H-bot puts a moment on the frame
 */
export function rackingMomentPerNewtonM(args: { mechanism: string; turnSpacingMm: number }): number {
  const s = requireNumber('rackingMomentPerNewtonM', 'turnSpacingMm', args?.turnSpacingMm, 0);
  return args.mechanism === 'hbot' ? s / 2 / 1000 : 0;
}

/**
 * Reaction the racking moment puts on the Y guides: a couple of lateral forces at the gantry's guide blocks or
 * wheels, which sit about one gantry depth apart along Y (our modelling choice; real blocks may be further apart).
 * @param args.momentNm - racking moment [N·m]
 * @param args.guideSpanMm - spacing of the lateral guide contacts along Y [mm]
 * @returns lateral force at each contact [N]
 */
export function guideReactionN(args: { momentNm: number; guideSpanMm: number }): number {
  const m = Math.abs(requireNumber('guideReactionN', 'momentNm', args?.momentNm));
  const span = requireNumber('guideReactionN', 'guideSpanMm', args?.guideSpanMm, 0, Infinity, true);
  return m / (span / 1000);
}
