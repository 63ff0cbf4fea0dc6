import type { Mechanism } from '@/engine';
import type { Page, PersonRef } from './common';
import type { MeasurementSource } from './enums';

/** A recording's spectrum as stored for plotting (at most 512 points): frequency [Hz] and level [dB] per point. */
export type Spectrum = { frequencyHz: number[]; magnitudeDb: number[] };

/** One recorded pluck of a belt span, as the API shows it. */
export type PublicMeasurement = {
  id: number;
  sheetId: number;
  spanId: string;
  beltId: string;
  spanLengthMm: number;
  linearMassKgPerM: number;
  frequencyHz: number;
  tensionN: number;
  targetFrequencyHz: number;
  targetTensionN: number;
  /** (tension − target) / target × 100 [%]. */
  deviationPct: number;
  source: MeasurementSource;
  /** 0..1 for recordings, null when typed. */
  confidence: number | null;
  hasSpectrum: boolean;
  recording: { sha256: string; size: number; fileName: string; url: string } | null;
  measuredBy: PersonRef;
  /** ISO 8601 timestamp */
  measuredAt: string;
};

/** A measurement with its spectrum (recordings only). */
export type MeasurementDetail = PublicMeasurement & { spectrum: Spectrum | null };

/** Where a span stands against its target tension. */
export type SpanStatus = 'unmeasured' | 'ok' | 'low' | 'high';

/** One span of the sheet with its target and the latest measurement. */
export type SpanSummary = {
  spanId: string;
  beltId: string;
  beltLabel: string;
  label: string;
  lengthMm: number;
  fixedLength: boolean;
  /** The span the sheet names for setting the belt's tension. */
  isReference: boolean;
  targetFrequencyHz: number;
  /** Pluck frequencies that count as on target [Hz]. */
  targetBandHz: { low: number; high: number };
  targetTensionN: number;
  latest: PublicMeasurement | null;
  count: number;
  status: SpanStatus;
};

/** The corresponding spans of the two crossed belts of a CoreXY stage and whether their tensions disagree. */
export type CrossedPair = {
  spanIds: [string, string];
  labels: [string, string];
  /** Latest measured tensions, null while a span is unmeasured [N]. */
  tensionsN: [number | null, number | null];
  /** |T₁ − T₂| / mean(T₁, T₂) × 100, null until both are measured [%]. */
  differencePct: number | null;
  isMismatch: boolean;
};

/** GET /api/sheets/:id/measurements: the page of measurements plus the per-span summary. */
export type SheetMeasurements = Page<PublicMeasurement> & {
  sheetId: number;
  mechanism: Mechanism;
  spans: SpanSummary[];
  pairs: CrossedPair[];
  tolerances: { crossedBeltPct: number; targetPct: number; source: string };
  /** The belt's allowable tight-side tension from the frozen inputs: a pluck reading above it needs attention [N]. */
  allowableTensionN: number;
  /** Whether the signed-in user may record (maker or admin). */
  canRecord: boolean;
};
