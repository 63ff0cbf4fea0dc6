// Typical values the engine uses when the designer leaves an optional input out. Each is labelled "typical value"
// wherever a user sees it; where each comes from is in docs/models/belt-tension.md and docs/models/racking.md.

/**
 * Allowable load per tooth in mesh of a 2 mm pitch, 6 mm wide round-tooth belt [N]: the typical value the
 * estimate is scaled from (belt makers' load tables, from memory).
 */
export const TYPICAL_TOOTH_ALLOWABLE_2MM_6MM_N = 12;

/**
 * Typical allowable load per tooth in mesh for a belt the designer gave no figure for: the 2 mm × 6 mm value
 * scaled with pitch × width, because a tooth's shear area grows with both.
 * @param args.pitchMm - belt pitch [mm]
 * @param args.widthMm - belt width [mm]
 * @returns allowable load per tooth [N]
 * @see docs/models/belt-tension.md §5
 */
export function typicalToothAllowableN(args: { pitchMm: number; widthMm: number }): number {
  return (TYPICAL_TOOTH_ALLOWABLE_2MM_6MM_N * (args.pitchMm * args.widthMm)) / (2 * 6);
}

/**
 * Typical rated moment about the vertical axis of a gantry's Y guides [N·m]: two 12 mm miniature profile-rail
 * carriages, one per side (guide makers' catalogues, from memory).
 * @see docs/models/racking.md §3
 */
export const TYPICAL_YAW_MOMENT_RATING_NM = 10;
