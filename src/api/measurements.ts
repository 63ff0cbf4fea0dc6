import { apiUrl, get, post, upload } from './http';
import type { Page } from './types';

/** How a frequency was obtained. */
export type MeasurementSource = 'typed' | 'recording';

/** Where a span stands against its target tension. */
export type SpanStatus = 'unmeasured' | 'ok' | 'low' | 'high';

/** A recording's spectrum, for plotting: frequency [Hz] and level [dB] per point. */
export interface Spectrum {
  frequencyHz: number[];
  magnitudeDb: number[];
}

/** One recorded pluck of a belt span. */
export interface Measurement {
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
  /** 0..1 for recordings; null when typed. */
  confidence: number | null;
  hasSpectrum: boolean;
  recording: { sha256: string; size: number; fileName: string; url: string } | null;
  measuredBy: { id: number; name: string };
  /** ISO 8601 timestamp */
  measuredAt: string;
}

/** A measurement with its spectrum (recordings only). */
export interface MeasurementDetail extends Measurement {
  spectrum: Spectrum | null;
}

/** One span of a sheet with its target and latest measurement. */
export interface SpanSummary {
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
  latest: Measurement | null;
  count: number;
  status: SpanStatus;
}

/** Corresponding spans of the two crossed belts of a CoreXY stage. */
export interface CrossedPair {
  spanIds: [string, string];
  labels: [string, string];
  tensionsN: [number | null, number | null];
  /** |T₁ − T₂| / mean × 100, null until both are measured [%]. */
  differencePct: number | null;
  isMismatch: boolean;
}

/** GET /api/sheets/:id/measurements. */
export interface SheetMeasurements extends Page<Measurement> {
  sheetId: number;
  mechanism: 'corexy' | 'hbot' | 'cartesian';
  spans: SpanSummary[];
  pairs: CrossedPair[];
  tolerances: { crossedBeltPct: number; targetPct: number; source: string };
  /** The belt's allowable tight-side tension [N]: a reading above it needs attention. */
  allowableTensionN: number;
  /** Whether the signed-in user may record (maker or admin). */
  canRecord: boolean;
}

/** Lists a sheet's measurements with the per-span summary and the crossed-belt comparison. */
export const listMeasurements = (sheetId: number): Promise<SheetMeasurements> => get(`/sheets/${sheetId}/measurements`);

/** Reads one measurement with its spectrum. */
export const getMeasurement = (sheetId: number, id: number): Promise<MeasurementDetail> => get(`/sheets/${sheetId}/measurements/${id}`);

/** Records a typed pluck frequency [Hz] for a span. */
export const recordTypedMeasurement = (sheetId: number, spanId: string, frequencyHz: number): Promise<MeasurementDetail> =>
  post(`/sheets/${sheetId}/measurements`, { spanId, frequencyHz });

/** Uploads a WAV recording of a plucked span; the server finds the frequency. */
export function recordPluckRecording(sheetId: number, spanId: string, file: File): Promise<MeasurementDetail> {
  const form = new FormData();
  form.append('spanId', spanId);
  form.append('file', file, file.name);
  return upload(`/sheets/${sheetId}/measurements`, form);
}

/** The download address of a measurement's stored recording. */
export const recordingUrl = (sheetId: number, id: number): string => apiUrl(`/sheets/${sheetId}/measurements/${id}/recording`);
