import { apiUrl, del, get, patch, post, upload } from './http';
import type { Page } from './types';

import {
  DESIGN_STATUSES,
  type CreateDesignBody,
  type DesignDetail,
  type DesignListItem,
  type DesignListQuery,
  type DesignSortKey,
  type DesignStatus,
  type JobUploadResult,
  type UpdateDesignBody,
  type VersionConflictDetails,
} from '@/contracts';

// Request and answer shapes come from the contract (src/contracts, request schemas in src/contracts/requests).
export { DESIGN_STATUSES, type DesignListQuery, type DesignSortKey, type DesignStatus, type JobUploadResult, type VersionConflictDetails };

/** One row of the Designs table (src/contracts DesignListItem). */
export type DesignSummary = DesignListItem;

/** A whole design, as GET /api/designs/:id answers (src/contracts DesignDetail). */
export type Design = DesignDetail;

/** Lists designs the signed-in user may see, one page at a time. */
export const listDesigns = (query: DesignListQuery = {}): Promise<Page<DesignSummary>> => get('/designs', { ...query });

/** Reads one design with its inputs. */
export const getDesign = (id: number): Promise<Design> => get(`/designs/${id}`);

/** Creates a design from a document, a template or a copy; answers the new design. */
export const createDesign = (input: CreateDesignBody): Promise<Design> => post('/designs', input);

/** Saves inputs and/or the name; answers 409 `version_conflict` when `version` is stale. */
export const updateDesign = (id: number, input: UpdateDesignBody): Promise<Design> => patch(`/designs/${id}`, input);

/** Deletes a draft. */
export const deleteDesign = (id: number): Promise<void> => del(`/designs/${id}`);

/** URL of the JSON export of a design (the browser downloads it). */
export const designExportUrl = (id: number): string => apiUrl(`/designs/${id}/export`);

/** File types the job upload accepts. */
export const JOB_CSV_ACCEPT = '.csv,.txt,text/csv,text/plain';

/** Replaces a design's job points with a CSV file (x, y, optional dwell) and saves the design at `version`. */
export function uploadDesignJob(id: number, file: File, version: number): Promise<JobUploadResult> {
  const form = new FormData();
  form.append('version', String(version));
  form.append('file', file, file.name);
  return upload(`/designs/${id}/job`, form);
}
