import { apiUrl, get, post, upload } from './http';
import type { MeasurementDetail, PublicMeasurement, SheetMeasurements, SpanStatus, SpanSummary, Spectrum } from '@/contracts';

export type { MeasurementDetail, SheetMeasurements, SpanStatus, SpanSummary, Spectrum };
/** One recorded pluck of a belt span (src/contracts PublicMeasurement). */
export type Measurement = PublicMeasurement;

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
