import type { DesignSummary } from '@/api/designs';

/** A Designs list row as the server sends it: a draft of Dana Designer's that the asker may open, edit and delete. */
export function designRow(over: Partial<DesignSummary> = {}): DesignSummary {
  return {
    id: 1,
    name: 'Bench stage',
    mechanism: 'corexy',
    status: 'draft',
    owner: { id: 2, name: 'Dana Designer' },
    travel: { xMm: 312, yMm: 320 },
    version: 1,
    updatedAt: '2026-11-20T10:00:00Z',
    createdAt: '2026-11-20T09:00:00Z',
    canOpen: true,
    canEdit: true,
    canDelete: true,
    ...over,
  };
}
