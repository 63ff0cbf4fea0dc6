import { isUnitSystem } from '@/format';
import type { PersonRef, RevisionListItem, RevisionSummaryFigures } from '@/contracts';
import type { Design, DesignMechanism, DesignStatus, Revision, Sheet, User } from '../models';
import { isOwnWork } from './access';
import { parseJson } from './storedJson';
import type { PublicUser } from './users.service';

// A revision row (with its design, author, decider and sheet loaded) as the API shows it in lists.

/** A revision row with what the list shape needs. */
export type RevisionRow = Revision & {
  design?: Design & { owner?: User | null };
  author?: User | null;
  decidedBy?: User | null;
  sheet?: Sheet | null;
};

const person = (user: User | null | undefined, fallbackId: number | null = null): PersonRef | null =>
  user ? { id: user.id, name: user.name } : fallbackId === null ? null : { id: fallbackId, name: '' };

/** A revision row as a list item for `actor` (`isOwn` is theirs). */
export function toRevisionListItem(row: RevisionRow, actor: PublicUser): RevisionListItem {
  const design = row.design!;
  const inputs = parseJson<{ name?: string; mechanism?: DesignMechanism }>(row.inputs);
  return {
    id: row.id,
    designId: row.designId,
    number: row.number,
    status: row.status,
    name: inputs.name ?? design.name,
    mechanism: inputs.mechanism ?? design.mechanism,
    design: { id: design.id, name: design.name, status: design.status as DesignStatus, owner: person(design.owner, design.ownerId)! },
    author: person(row.author, row.authorId)!,
    submittedAt: new Date(row.submittedAt).toISOString(),
    decidedBy: person(row.decidedBy, row.decidedById),
    decidedAt: row.decidedAt ? new Date(row.decidedAt).toISOString() : null,
    returnReason: row.status === 'returned' ? row.decisionNote : null,
    approvalComment: row.status === 'approved' ? (row.decisionNote ?? '') : null,
    approvalJustification: row.status === 'approved' ? (row.approvalJustification ?? null) : null,
    sheetUnits: isUnitSystem(row.sheetUnits) ? row.sheetUnits : 'metric',
    sheetId: row.sheet?.id ?? null,
    engineVersion: row.engineVersion,
    fingerprint: row.fingerprint,
    summary: parseJson<RevisionSummaryFigures>(row.summary),
    isOwn: isOwnWork(actor, row, design),
  };
}
