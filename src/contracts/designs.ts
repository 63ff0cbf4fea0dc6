import type { DesignInput, Mechanism } from '@/engine';
import type { PublicAttachment } from './attachments';
import type { PersonRef } from './common';
import type { DesignStatus, ReadOnlyReason } from './enums';

/**
 * A few numbers of the engine result, stored at save time so lists and cards need not re-run the engine.
 * `engineVersion` says which engine computed them.
 */
export type DesignResultSummary = {
  engineVersion: string;
  stepsPerMm: number;
  /** Carriage figures of one microstep (engine 2 on; docs/models/resolution.md). */
  microstep?: { oneMotorMm: number; oneMotorDirectionDeg: number; axisMm: number; diagonalMm: number };
  /** Engine 1 summaries only: one motor's microstep projected on X and Y. */
  microstepMm?: { x: number; y: number; diagonal: number };
  /** The worst-acceleration direction and its accelerations; speedMaxMPerS is the lowest top speed over all directions. */
  worst: { directionDeg: number; accelMaxMPerS2: number; accelAtCruiseMPerS2: number; speedMaxMPerS: number };
  lowestFrequencyHz: number;
  checks: { total: number; bySeverity: Record<string, number> };
};

/** A design as the Designs table shows it. `canEdit`/`canDelete` are for the signed-in user who asked. */
export type DesignListItem = {
  id: number;
  name: string;
  mechanism: Mechanism;
  status: DesignStatus;
  owner: PersonRef;
  /** Usable travel the engine derived from the frame, computed at every save [mm]. */
  travel: { xMm: number; yMm: number };
  /** Optimistic-lock version: send it back with every change. */
  version: number;
  /** ISO 8601 timestamps */
  updatedAt: string;
  createdAt: string;
  /**
   * Whether the signed-in user may open (read) this design now: false for someone else's design while it is in review,
   * unless the asker reviews or wrote that revision (the list still names it, so the team sees what is in review).
   */
  canOpen: boolean;
  /** Whether the signed-in user may change this design now (the server decides: access rules and state). */
  canEdit: boolean;
  /** Whether the signed-in user may delete this design now. */
  canDelete: boolean;
};

/**
 * Whether the signed-in user may edit the design's inputs now, and if not why (the server decides with its access
 * rules; the client words the reason with the formatting layer's `readOnlyReasonText`). `ok` equals `canEdit`.
 */
export type DesignEditable = { ok: true; reason: null } | { ok: false; reason: ReadOnlyReason };

/** A design with its inputs (the design document, defaults filled in) and the summary computed when it was last saved. */
export type DesignDetail = DesignListItem & {
  inputs: DesignInput;
  /** May the asker edit it now, and if not, why. */
  editable: DesignEditable;
  /** Who saved last. */
  updatedBy: PersonRef | null;
  latestResultSummary: DesignResultSummary | null;
};

/** What a job upload (POST /api/designs/:id/job) answers: the saved design, what was read and the file kept with the design. */
export type JobUploadResult = {
  design: DesignDetail;
  /** Units the file's header named (or the defaults it fell back to); `dwell` null without a dwell column. */
  job: { pointCount: number; sourceUnits: { x: 'mm' | 'in'; y: 'mm' | 'in'; dwell: 's' | 'ms' | null } };
  file: PublicAttachment | null;
};

/**
 * The `details` of a 409 `version_conflict` answer to a save (PATCH /api/designs/:id, the job upload): the version now
 * stored, who saved it and when.
 */
export type VersionConflictDetails = { currentVersion: number; updatedBy: PersonRef | null; updatedAt: string };
