// The closed sets of words the API, the database and the screens share. One declaration each: the models build their
// ENUM columns from these, the zod schemas accept exactly these, and the client's unions are these types.

/** The four roles; a user may hold several (or none, until an admin grants one). */
export const ROLES = ['admin', 'designer', 'reviewer', 'maker'] as const;
export type Role = (typeof ROLES)[number];

/** The states of a design: a draft goes into review, comes back returned (editable again) or is approved. */
export const DESIGN_STATUSES = ['draft', 'in_review', 'approved', 'returned'] as const;
export type DesignStatus = (typeof DESIGN_STATUSES)[number];

/** States in which a design's inputs may still change; a design in review or approved is frozen. */
export const EDITABLE_DESIGN_STATUSES: readonly DesignStatus[] = ['draft', 'returned'];

/** Review states of a revision. Only `in_review` may still change; the others are final. */
export const REVISION_STATUSES = ['in_review', 'withdrawn', 'returned', 'approved'] as const;
export type RevisionStatus = (typeof REVISION_STATUSES)[number];

/** The three shelves of the parts shelf. */
export const PART_KINDS = ['belt', 'pulley', 'motor'] as const;
export type PartKind = (typeof PART_KINDS)[number];

/** Paper sizes every sheet is rendered in. */
export const SHEET_PAPERS = ['A4', 'LETTER'] as const;
export type SheetPaper = (typeof SHEET_PAPERS)[number];

/** How a belt measurement's frequency was obtained: typed in, or found in an uploaded recording. */
export const MEASUREMENT_SOURCES = ['typed', 'recording'] as const;
export type MeasurementSource = (typeof MEASUREMENT_SOURCES)[number];

/** Roles of a pulley on the parts shelf: a drive pulley on a motor shaft, a toothed idler, a smooth (flat) idler. */
export const PULLEY_KINDS = ['drive', 'idler-toothed', 'idler-smooth'] as const;
export type PulleyKind = (typeof PULLEY_KINDS)[number];

/**
 * Why a design's inputs are read-only for the one who asks (`DesignDetail.editable`), in the order the server checks:
 * in review (frozen until a reviewer decides); approved, and the asker may start a new revision; approved, and only its
 * owner or an admin may; the asker is neither designer nor admin; the design belongs to another designer.
 */
export const READ_ONLY_REASONS = ['in_review', 'approved_reopenable', 'approved', 'not_designer', 'not_owner'] as const;
export type ReadOnlyReason = (typeof READ_ONLY_REASONS)[number];
