import type { Page, SheetDetail, SheetListItem, SheetListQuery, SheetPaper } from '@/contracts';
import { apiUrl, get } from './http';

export type { SheetDetail, SheetListItem, SheetPaper };

/**
 * Lists approved sheets, newest approval first. The query is the contract's, except that `current` is a flag here:
 * true asks only for sheets not superseded by a later approval (sent as `current=true`).
 */
export const listSheets = (query: Omit<SheetListQuery, 'current'> & { current?: boolean } = {}): Promise<Page<SheetListItem>> =>
  get('/sheets', { ...query, current: query.current ? 'true' : undefined });

/** Reads one sheet with its build figures. */
export const getSheet = (id: number): Promise<SheetDetail> => get(`/sheets/${id}`);

/** The download address of a sheet's PDF (the browser fetches it itself). */
export const sheetPdfUrl = (id: number, paper: SheetPaper = 'A4'): string =>
  apiUrl(`/sheets/${id}/pdf`, { paper: paper === 'A4' ? 'a4' : 'letter' });
