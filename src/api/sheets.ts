import type { Page, SheetDetail, SheetListItem, SheetPaper } from '@/contracts';
import { apiUrl, get } from './http';

export type { SheetDetail, SheetListItem, SheetPaper };

/** Query of the Sheets list. */
export interface SheetListQuery {
  page?: number;
  pageSize?: number;
  designId?: number;
  /** Only sheets not superseded by a later approval. */
  current?: boolean;
}

/** Lists approved sheets, newest approval first. */
export const listSheets = (query: SheetListQuery = {}): Promise<Page<SheetListItem>> =>
  get('/sheets', { ...query, current: query.current ? 'true' : undefined });

/** Reads one sheet with its build figures. */
export const getSheet = (id: number): Promise<SheetDetail> => get(`/sheets/${id}`);

/** The download address of a sheet's PDF (the browser fetches it itself). */
export const sheetPdfUrl = (id: number, paper: SheetPaper = 'A4'): string =>
  apiUrl(`/sheets/${id}/pdf`, { paper: paper === 'A4' ? 'a4' : 'letter' });
