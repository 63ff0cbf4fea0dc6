import { Op, type Transaction } from 'sequelize';
import type { MigrationFn } from 'umzug';
import { parseDesign, type DesignInput } from '@/engine';
import type { SeedContext } from '../migrator';
import { AuditLog, Design, Revision, RevisionComment, Sheet, User, type DesignStatus, type RevisionStatus } from '../models';
import { freezeDesign } from '../services/freezeRevision';
import { renderSheetFiles } from '../services/sheets.service';
import { getContentStore, markUnreferenced, referenceContent, removeUnreferencedContent } from '../storage';
import { sha256Of } from '../uploads';
import { DEMO_DESIGNS, demoDesignDocument } from './202612020102-demo-designs';
import { createSheetFreezeTriggers, dropSheetFreezeTriggers } from '../migrations/sheetFreeze';

// The review history of the demo workshop, so a fresh start shows every state:
//   Bench dispensing stage  revision 1 approved (its sheet now superseded), reopened, revision 2 approved (current sheet)
//   A3 pen plotter          revision 1 returned with a reason and a short discussion; the design is returned
//   Wide dispensing stage   revision 1 withdrawn, revision 2 (changed inputs) waiting in review — the older of the two
//   Label placer            revision 1 waiting in review, with a reviewer's question
//   Sample tray picker      stays a draft
// Rows are written with the models on the seeder's connection (not through the services, which use the app's own
// connection); sheets are rendered by the same renderer the approval uses, from the frozen revision. No mail is sent.

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

type Users = { designer: User; designer2: User; reviewer: User; admin: User };

async function demoUsers(): Promise<Users> {
  const emails = ['designer@example.test', 'designer2@example.test', 'reviewer@example.test', 'admin@example.test'];
  const rows = await User.findAll({ where: { email: { [Op.in]: emails } } });
  const by = (email: string) => {
    const user = rows.find((u) => u.email === email);
    if (!user) throw new Error(`the review demo needs the demo user ${email} (seeder 202612020001-demo-users)`);
    return user;
  };
  return { designer: by(emails[0]), designer2: by(emails[1]), reviewer: by(emails[2]), admin: by(emails[3]) };
}

async function demoDesign(name: string, owner: User, transaction: Transaction): Promise<Design> {
  const design = await Design.findOne({ where: { name, ownerId: owner.id }, transaction });
  if (!design) throw new Error(`the review demo needs the demo design "${name}" (seeder 202612020102-demo-designs)`);
  return design;
}

/** The design document of a demo design with `edit` applied (the state of an earlier revision). */
function variant(name: string, edit: (d: DesignInput) => Partial<DesignInput>): DesignInput {
  const demo = DEMO_DESIGNS.find((d) => d.name === name)!;
  const doc = demoDesignDocument(demo);
  return parseDesign({ ...doc, ...edit(doc) });
}

async function audit(
  t: Transaction,
  at: Date,
  actor: User,
  action: string,
  entity: string,
  entityId: number,
  from: string | null,
  to: string | null,
  reason: string | null,
): Promise<void> {
  await AuditLog.create(
    { actorId: actor.id, action, entity, entityId, fromState: from, toState: to, reason, createdAt: at },
    { transaction: t },
  );
}

/** Freezes `inputs` as revision `number` of `design`, submitted by `author` at `at`, and logs it. */
async function submit(
  t: Transaction,
  design: Design,
  number: number,
  inputs: DesignInput,
  author: User,
  at: Date,
  designFrom: DesignStatus = 'draft',
): Promise<Revision> {
  const frozen = freezeDesign(inputs);
  const revision = await Revision.create(
    {
      designId: design.id,
      number,
      status: 'in_review',
      inputs: frozen.inputs as unknown as Record<string, unknown>,
      result: frozen.result as unknown as Record<string, unknown>,
      summary: frozen.summary,
      engineVersion: frozen.result.engineVersion,
      fingerprint: frozen.fingerprint,
      authorId: author.id,
      submittedAt: at,
      decidedById: null,
      decidedAt: null,
      decisionNote: null,
      createdAt: at,
      updatedAt: at,
    },
    { transaction: t, silent: true },
  );
  await audit(t, at, author, 'design.submit', 'design', design.id, designFrom, 'in_review', `Submitted revision ${number}`);
  await audit(
    t,
    at,
    author,
    'revision.submit',
    'revision',
    revision.id,
    null,
    'in_review',
    `Revision ${number} of design ${design.id}, fingerprint ${frozen.fingerprint}`,
  );
  return revision;
}

/** Records a decision on a revision (the revision's own row changes only its review state). */
async function decide(
  t: Transaction,
  design: Design,
  revision: Revision,
  status: RevisionStatus,
  by: User,
  at: Date,
  note: string | null,
): Promise<void> {
  await revision.update({ status, decidedById: by.id, decidedAt: at, decisionNote: note, updatedAt: at }, { transaction: t, silent: true });
  const designTo: DesignStatus = status === 'withdrawn' ? 'draft' : (status as DesignStatus);
  const verb = status === 'withdrawn' ? 'withdraw' : status === 'approved' ? 'approve' : 'return';
  await audit(
    t,
    at,
    by,
    `design.${verb}`,
    'design',
    design.id,
    'in_review',
    designTo,
    note ?? `${verb === 'withdraw' ? 'Withdrew' : 'Approved'} revision ${revision.number}`,
  );
  await audit(t, at, by, `revision.${verb}`, 'revision', revision.id, 'in_review', status, note);
}

/** Renders and stores the sheet of an approved revision, as the approval does. */
async function publish(
  t: Transaction,
  design: Design,
  revision: Revision,
  author: User,
  reviewer: User,
  at: Date,
  comment: string,
): Promise<void> {
  const inputs = revision.inputs as unknown as DesignInput;
  const rendered = await renderSheetFiles({
    designName: inputs.name,
    revisionNumber: revision.number,
    mechanism: inputs.mechanism,
    designer: { name: author.name, email: author.email },
    approval: { reviewerName: reviewer.name, approvedAt: at, comment },
    inputs,
    result: revision.result as never,
    fingerprint: revision.fingerprint,
  });
  // As at a real approval: the PDFs go to the content store, registered in use in the same transaction.
  const store = getContentStore();
  for (const bytes of [rendered.a4, rendered.letter]) {
    await referenceContent(sha256Of(bytes), bytes.length, t);
    await store.put(bytes);
  }
  const sheet = await Sheet.create(
    {
      revisionId: revision.id,
      designId: design.id,
      approvedById: reviewer.id,
      approvedAt: at,
      comment,
      a4Pdf: null,
      a4Sha256: rendered.a4Sha256,
      a4Size: rendered.a4.length,
      letterPdf: null,
      letterSha256: rendered.letterSha256,
      letterSize: rendered.letter.length,
      createdAt: at,
    },
    { transaction: t },
  );
  await audit(
    t,
    at,
    reviewer,
    'sheet.publish',
    'sheet',
    sheet.id,
    null,
    'published',
    `A4 SHA-256 ${rendered.a4Sha256}; Letter SHA-256 ${rendered.letterSha256}`,
  );
}

async function comment(
  t: Transaction,
  revision: Revision,
  author: User,
  at: Date,
  body: string,
  parent: RevisionComment | null = null,
): Promise<RevisionComment> {
  return RevisionComment.create(
    { revisionId: revision.id, parentId: parent?.id ?? null, authorId: author.id, body, createdAt: at },
    { transaction: t },
  );
}

async function setDesign(t: Transaction, design: Design, status: DesignStatus, at: Date): Promise<void> {
  await design.sequelize.query('UPDATE designs SET status = ?, updated_at = ? WHERE id = ?', {
    replacements: [status, at, design.id],
    transaction: t,
  });
}

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  const users = await demoUsers();
  const now = Date.now();
  const at = (daysAgo: number, hours = 0) => new Date(now - daysAgo * DAY + hours * HOUR);

  // One transaction: the demo history appears whole or not at all (rendering the four PDFs inside it takes a few
  // seconds; nothing else uses the database while seeding).
  await context.sequelize.transaction(async (t) => {
    if ((await Revision.count({ transaction: t })) > 0) return; // someone already made revisions: leave them

    // Bench dispensing stage: approved twice; the first sheet is superseded by the second.
    const bench = await demoDesign('Bench dispensing stage', users.designer, t);
    const benchV1 = variant('Bench dispensing stage', () => ({ plannedAccelMmPerS2: 2500, pretensionN: 40 }));
    const benchR1 = await submit(t, bench, 1, benchV1, users.designer, at(20), 'draft');
    await comment(
      t,
      benchR1,
      users.reviewer,
      at(19, 2),
      'Travel and tension look right. Building the first one at 2500 mm/s² is a sensible start.',
    );
    await decide(t, bench, benchR1, 'approved', users.reviewer, at(19, 3), 'Fine to build for the first batch.');
    await publish(t, bench, benchR1, users.designer, users.reviewer, at(19, 3), 'Fine to build for the first batch.');
    await audit(t, at(12), users.designer, 'design.reopen', 'design', bench.id, 'approved', 'draft', 'Reopened for a new revision');
    const benchV2 = demoDesignDocument(DEMO_DESIGNS.find((d) => d.name === 'Bench dispensing stage')!);
    const benchR2 = await submit(t, bench, 2, benchV2, users.designer, at(11), 'draft');
    await comment(
      t,
      benchR2,
      users.reviewer,
      at(10, 1),
      'Higher acceleration and pretension: the slack side still stays taut at the ends of travel and the checks pass. Approving.',
    );
    await decide(
      t,
      bench,
      benchR2,
      'approved',
      users.reviewer,
      at(10, 2),
      'Approved for the second batch; tension the belts to the new targets.',
    );
    await publish(
      t,
      bench,
      benchR2,
      users.designer,
      users.reviewer,
      at(10, 2),
      'Approved for the second batch; tension the belts to the new targets.',
    );
    await setDesign(t, bench, 'approved', at(10, 2));

    // A3 pen plotter: returned with a reason and a short discussion; still returned (editable).
    const plotter = await demoDesign('A3 pen plotter', users.designer, t);
    const plotterDoc = demoDesignDocument(DEMO_DESIGNS.find((d) => d.name === 'A3 pen plotter')!);
    const plotterR1 = await submit(t, plotter, 1, plotterDoc, users.designer, at(6));
    const question = await comment(
      t,
      plotterR1,
      users.reviewer,
      at(5, 1),
      'The gantry on an H-bot racks under acceleration. How stiff is the gantry guide over 500 mm?',
    );
    await comment(
      t,
      plotterR1,
      users.designer,
      at(5, 3),
      'Two linear rails, 420 mm apart. I had not checked the racking figure against them.',
      question,
    );
    await comment(
      t,
      plotterR1,
      users.reviewer,
      at(5, 4),
      'Then please look at the racking force in the checks before we buy rails.',
      question,
    );
    const reason =
      'The racking check fails: at full X pull the H belt twists the gantry harder than the two rail carriages are rated for. Choose carriages with a higher yaw moment rating or limit the X pull; then submit again.';
    await decide(t, plotter, plotterR1, 'returned', users.reviewer, at(5, 5), reason);
    await setDesign(t, plotter, 'returned', at(5, 5));

    // Wide dispensing stage (designer2): revision 1 withdrawn, revision 2 with changed inputs waits in review.
    const wide = await demoDesign('Wide dispensing stage', users.designer2, t);
    const wideV1 = variant('Wide dispensing stage', (d) => ({ pretensionN: 45, driver: { ...d.driver, microsteps: 8 } }));
    const wideR1 = await submit(t, wide, 1, wideV1, users.designer2, at(4));
    await decide(t, wide, wideR1, 'withdrawn', users.designer2, at(4, 1), null);
    await submit(
      t,
      wide,
      2,
      demoDesignDocument(DEMO_DESIGNS.find((d) => d.name === 'Wide dispensing stage')!),
      users.designer2,
      at(3),
      'draft',
    );
    await setDesign(t, wide, 'in_review', at(3));

    // Label placer: waiting in review, with a question from the reviewer.
    const placer = await demoDesign('Label placer', users.designer, t);
    const placerR1 = await submit(
      t,
      placer,
      1,
      demoDesignDocument(DEMO_DESIGNS.find((d) => d.name === 'Label placer')!),
      users.designer,
      at(1),
    );
    await comment(t, placerR1, users.reviewer, at(0, -2), 'Is the label head mass with or without the vacuum fitting?');
    await setDesign(t, placer, 'in_review', at(1));
  });
};

export const down: MigrationFn<SeedContext> = async ({ context }) => {
  const names = ['Bench dispensing stage', 'A3 pen plotter', 'Wide dispensing stage', 'Label placer'];
  const designs = await Design.findAll({ where: { name: { [Op.in]: names } }, attributes: ['id'] });
  const designIds = designs.map((d) => d.id);
  if (!designIds.length) return;
  const revisionIds = (await Revision.findAll({ where: { designId: { [Op.in]: designIds } }, attributes: ['id'] })).map((r) => r.id);
  const sheets = await Sheet.findAll({ where: { designId: { [Op.in]: designIds } }, attributes: ['id', 'a4Sha256', 'letterSha256'] });
  const sheetIds = sheets.map((s) => s.id);
  // Published sheets refuse DELETE; seeders run as the schema owner, who lifts the triggers for the unseed only
  // (DROP/CREATE TRIGGER commit implicitly, so they stay outside the transaction).
  await dropSheetFreezeTriggers(context.sequelize);
  try {
    await unseedReview(context, { designIds, revisionIds, sheetIds });
  } finally {
    await createSheetFreezeTriggers(context.sequelize);
  }
  // The sheets' PDFs leave the content store unless something else refers to the same bytes.
  const orphaned: string[] = [];
  for (const sha256 of new Set(sheets.flatMap((s) => [s.a4Sha256, s.letterSha256]))) {
    if (await context.sequelize.transaction((transaction) => markUnreferenced(sha256, transaction))) orphaned.push(sha256);
  }
  await removeUnreferencedContent(orphaned, getContentStore(), context.sequelize);
};

async function unseedReview(
  context: SeedContext,
  { designIds, revisionIds, sheetIds }: { designIds: number[]; revisionIds: number[]; sheetIds: number[] },
): Promise<void> {
  await context.sequelize.transaction(async (transaction) => {
    await AuditLog.destroy({
      where: {
        [Op.or]: [
          {
            entity: 'design',
            entityId: { [Op.in]: designIds },
            action: { [Op.in]: ['design.submit', 'design.withdraw', 'design.approve', 'design.return', 'design.reopen'] },
          },
          { entity: 'revision', entityId: { [Op.in]: revisionIds.length ? revisionIds : [0] } },
          { entity: 'sheet', entityId: { [Op.in]: sheetIds.length ? sheetIds : [0] } },
        ],
      },
      transaction,
    });
    await Sheet.destroy({ where: { id: { [Op.in]: sheetIds.length ? sheetIds : [0] } }, transaction });
    await Revision.destroy({ where: { designId: { [Op.in]: designIds } }, transaction }); // their comments go with them
    await Design.update({ status: 'draft' }, { where: { id: { [Op.in]: designIds } }, transaction });
  });
}
