import type { DesignInput, DesignInputRaw, DesignResult, Mechanism, Severity } from '@/engine';
import type { UnitSystem } from '@/format';

export type { DesignInput, DesignResult, Mechanism, Severity };

/** Everything the design sheet prints. All of it comes from the frozen revision and its approval. */
export interface SheetInput {
  /** Design name as the app shows it. */
  designName: string;
  /** Revision number within the design (1, 2, …). */
  revisionNumber: number;
  mechanism: Mechanism;
  /** Author of the revision. */
  designer: { name: string; email: string };
  /** The approval that publishes this sheet. */
  approval: {
    reviewerName: string;
    approvedAt: Date | string;
    comment: string;
    /** Why the reviewer approved although a check failed (printed beside the checks); null or absent otherwise. */
    justification?: string | null;
  };
  /** The revision's frozen design document (src/engine/README.md); defaults are filled in again with the engine's schema. */
  inputs: DesignInputRaw | DesignInput;
  /** The revision's frozen engine result (evaluateDesign output), never a recomputation. */
  result: DesignResult;
  /** SHA-256 (64 hex digits) of the frozen inputs and results. */
  fingerprint: string;
  paper: 'A4' | 'LETTER';
  /** Base address of the app, printed as where sheets and tension records live. */
  appUrl?: string;
  /** Unit system every quantity is printed in (default metric). */
  units?: UnitSystem;
}

/** SheetInput with the design validated and its defaults filled in. */
export interface SheetData extends SheetInput {
  design: DesignInput;
  units: UnitSystem;
}
