import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ENGINE_VERSION, evaluateDesign, parseDesign, type DesignInput } from '@/engine';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize, getSequelize } from '../../server/db';
import { Op } from 'sequelize';
import { AuditLog, Design, Notification, Revision, type Role } from '../../server/models';
import { deliverQueuedMail } from '../../server/services/notify.service';
import { summaryFigures } from '../../server/services/freezeRevision';
import { revisionFingerprint } from '../../server/services/revisionFingerprint';
import { engineOneResult } from '../unit/server/sheet/fixtures/sheetInput';
import type { PublicUser } from '../../server/services/users.service';
import { createDesign, createUser, fetchOutbox, signedInAs, waitForMail, type Agent } from '../helpers/factories';

// Mail goes to the real test catcher over SMTP. Only the addresses a test puts in `failing` get a refused
// delivery, to show that a mail failure never loses a transition and that the queue retries it.
const failing = vi.hoisted(() => ({ addresses: new Set<string>() }));
vi.mock('../../server/services/mail.service', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../server/services/mail.service')>();
  return {
    ...real,
    sendMail: async (input: Parameters<typeof real.sendMail>[0]) =>
      failing.addresses.has(String(input.to)) ? false : real.sendMail(input),
  };
});

// Approval renders two PDFs (a few seconds each on a busy machine).
vi.setConfig({ testTimeout: 120_000, hookTimeout: 120_000 });

const app = createApp();
afterAll(() => closeSequelize());

type Who = 'owner' | 'otherDesigner' | 'reviewer' | 'reviewer2' | 'admin' | 'maker' | 'dual' | 'noRole';
const agents = {} as Record<Who, Agent>;
const users = {} as Record<Who, PublicUser>;
const emails = {} as Record<Who, string>;
let anonymous: Agent;

beforeAll(async () => {
  const roles: Record<Who, Role[]> = {
    owner: ['designer'],
    otherDesigner: ['designer'],
    reviewer: ['reviewer'],
    reviewer2: ['reviewer'],
    admin: ['admin'],
    maker: ['maker'],
    dual: ['designer', 'reviewer'],
    noRole: [],
  };
  for (const who of Object.keys(roles) as Who[]) {
    const signed = await signedInAs(app, roles[who]);
    agents[who] = signed.agent;
    users[who] = signed.user;
    emails[who] = signed.email;
  }
  anonymous = request.agent(app);
});

/** A draft of `owner` (the owner designer by default). */
async function draft(owner: Who = 'owner', edit?: (d: DesignInput) => DesignInput) {
  return createDesign({ owner: users[owner], edit });
}

/** Submits through the API and returns the revision, failing loudly if the submit is refused. */
async function submitted(owner: Who = 'owner', edit?: (d: DesignInput) => DesignInput) {
  const design = await draft(owner, edit);
  const res = await agents[owner].post(`/api/designs/${design.id}/submit`).send({});
  if (res.status !== 201) throw new Error(`submit failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { design, revision: res.body as { id: number; number: number; fingerprint: string } };
}

async function designStatus(id: number): Promise<string | undefined> {
  return (await Design.findByPk(id))?.status;
}

async function auditOf(entity: string, entityId: number) {
  const rows = await AuditLog.findAll({ where: { entity, entityId }, order: [['id', 'ASC']] });
  return rows.map((r) => ({ action: r.action, actorId: r.actorId, from: r.fromState, to: r.toState, reason: r.reason }));
}

const canonical = (v: unknown): string => {
  if (v === null || typeof v !== 'object') return JSON.stringify(v) ?? 'null';
  if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
  return `{${Object.keys(v)
    .sort()
    .filter((k) => (v as Record<string, unknown>)[k] !== undefined)
    .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
    .join(',')}}`;
};

describe('POST /api/designs/:id/submit', () => {
  it('when the owner submits a draft, then revision 1 freezes the inputs and full engine result with a fingerprint, and the design is in review', async () => {
    // Arrange
    const design = await draft();

    // Act
    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({});

    // Assert
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      designId: design.id,
      number: 1,
      status: 'in_review',
      engineVersion: ENGINE_VERSION,
      name: design.name,
      author: { id: users.owner.id, name: users.owner.name },
      returnReason: null,
      approvalComment: null,
      sheetId: null,
      previousRevisionId: null,
      isOwn: true,
      permissions: { canDecide: false, canComment: true, canWithdraw: true },
    });
    expect(res.body.inputs).toEqual(design.inputs);
    expect(res.body.result).toEqual(JSON.parse(JSON.stringify(evaluateDesign(design.inputs))));
    const expectedFingerprint = createHash('sha256')
      .update(canonical({ inputs: res.body.inputs, result: res.body.result }))
      .digest('hex');
    expect(res.body.fingerprint).toBe(expectedFingerprint);
    expect(await designStatus(design.id)).toBe('in_review');
    const stored = await Revision.findByPk(res.body.id);
    expect(stored?.fingerprint).toBe(expectedFingerprint);
  });

  it('when submitted, then every reviewer except the author gets a mail with a link to the review, and the audit log has the transition', async () => {
    const design = await draft('dual');

    const res = await agents.dual.post(`/api/designs/${design.id}/submit`).send({});
    const mail = await waitForMail(emails.reviewer, `${design.name}, revision 1`);
    await waitForMail(emails.reviewer2, `${design.name}, revision 1`);

    expect(res.status).toBe(201);
    expect(mail.subject).toBe(`Review requested: ${design.name}, revision 1`);
    expect(mail.text).toContain(`${getConfig().appUrl}/review/${res.body.id}`);
    expect(mail.html).toContain(`href="${getConfig().appUrl}/review/${res.body.id}"`);
    // The author holds the reviewer role too, but is not asked to review their own work; makers are not asked.
    const toAuthor = (await fetchOutbox(emails.dual)).filter((m) => m.subject.includes(design.name));
    const toMaker = (await fetchOutbox(emails.maker)).filter((m) => m.subject.includes(design.name));
    expect(toAuthor).toEqual([]);
    expect(toMaker).toEqual([]);
    expect(await auditOf('design', design.id)).toEqual([
      { action: 'design.submit', actorId: users.dual.id, from: 'draft', to: 'in_review', reason: 'Submitted revision 1' },
    ]);
    expect(await auditOf('revision', res.body.id)).toEqual([
      {
        action: 'revision.submit',
        actorId: users.dual.id,
        from: null,
        to: 'in_review',
        reason: expect.stringContaining(res.body.fingerprint),
      },
    ]);
  });

  it('when a design in review is submitted again, then 409 and no second revision', async () => {
    const { design } = await submitted();

    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({});

    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({
      code: 'invalid_state',
      message: 'This design is in review; only a draft or a returned design can be submitted.',
    });
    expect(await Revision.count({ where: { designId: design.id } })).toBe(1);
  });

  it.each([
    ['otherDesigner', 403],
    ['reviewer', 403],
    ['maker', 403],
    ['noRole', 403],
  ] as const)('when %s submits the owner’s draft, then %i and the design stays a draft', async (who, status) => {
    const design = await draft();

    const res = await agents[who].post(`/api/designs/${design.id}/submit`).send({});

    expect(res.status).toBe(status);
    expect(res.body.error.code).toBe('forbidden');
    expect(await designStatus(design.id)).toBe('draft');
    expect(await Revision.count({ where: { designId: design.id } })).toBe(0);
  });

  it('when signed out, then 401', async () => {
    const design = await draft();
    const res = await anonymous.post(`/api/designs/${design.id}/submit`).send({});
    expect(res.status).toBe(401);
  });

  it('when an admin submits someone’s draft, then 201 with the admin as author', async () => {
    const design = await draft();
    const res = await agents.admin.post(`/api/designs/${design.id}/submit`).send({});
    expect(res.status).toBe(201);
    expect(res.body.author.id).toBe(users.admin.id);
  });

  it('when the design does not exist or the id is not a number, then 404 or 400', async () => {
    const missing = await agents.owner.post('/api/designs/2147483000/submit').send({});
    const bad = await agents.owner.post('/api/designs/abc/submit').send({});
    expect(missing.status).toBe(404);
    expect(bad.status).toBe(400);
    expect(bad.body.error.details).toEqual([{ path: 'id', message: 'must be a positive whole number' }]);
  });

  it('when the stored inputs do not validate, then 400 names the input and nothing is frozen', async () => {
    const design = await draft();
    const broken = { ...design.inputs, belt: { ...design.inputs.belt, pitchMm: -2 } };
    await getSequelize().query('UPDATE designs SET inputs = ? WHERE id = ?', { replacements: [JSON.stringify(broken), design.id] });

    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({});

    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain('inputs.belt.pitchMm');
    expect(await designStatus(design.id)).toBe('draft');
    expect(await Revision.count({ where: { designId: design.id } })).toBe(0);
  });

  it('when the submit names an older version than the stored one, then 409 version_conflict', async () => {
    const design = await draft();
    await agents.owner.patch(`/api/designs/${design.id}`).send({ name: `${design.name} b`, version: 1 });

    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({ version: 1 });

    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('version_conflict');
  });

  it('when the body has an unknown field, then 400 names it', async () => {
    const design = await draft();
    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({ force: true });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'force', message: 'is not a known field' }]);
  });

  it('when a design is in review, then PATCH of its inputs is refused and the revision keeps its inputs', async () => {
    const { design, revision } = await submitted();

    const patch = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'Changed behind the reviewer', version: 1 });
    const after = await agents.owner.get(`/api/revisions/${revision.id}`);

    expect(patch.status).toBe(409);
    expect(after.body.inputs.name).toBe(design.name);
    expect(after.body.fingerprint).toBe(revision.fingerprint);
  });
});

describe('POST /api/designs/:id/withdraw', () => {
  it('when the owner withdraws, then the revision is withdrawn, the design a draft again, and the audit log says so', async () => {
    const { design, revision } = await submitted();

    const res = await agents.owner.post(`/api/designs/${design.id}/withdraw`).send({});

    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: revision.id, status: 'withdrawn', decidedBy: { id: users.owner.id } });
    expect(await designStatus(design.id)).toBe('draft');
    expect(await auditOf('design', design.id)).toEqual([
      { action: 'design.submit', actorId: users.owner.id, from: 'draft', to: 'in_review', reason: 'Submitted revision 1' },
      { action: 'design.withdraw', actorId: users.owner.id, from: 'in_review', to: 'draft', reason: 'Withdrew revision 1' },
    ]);
  });

  it.each(['otherDesigner', 'reviewer', 'maker'] as const)(
    'when %s withdraws the owner’s design, then 403 and it stays in review',
    async (who) => {
      const { design } = await submitted();
      const res = await agents[who].post(`/api/designs/${design.id}/withdraw`).send({});
      expect(res.status).toBe(403);
      expect(await designStatus(design.id)).toBe('in_review');
    },
  );

  it('when a draft is withdrawn, then 409', async () => {
    const design = await draft();
    const res = await agents.owner.post(`/api/designs/${design.id}/withdraw`).send({});
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({
      code: 'invalid_state',
      message: 'This design is a draft, not in review; there is nothing to withdraw.',
    });
  });

  it('when a withdrawn revision is approved or returned, then 409', async () => {
    const { design, revision } = await submitted();
    await agents.owner.post(`/api/designs/${design.id}/withdraw`).send({});

    const approve = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'late' });
    const ret = await agents.reviewer.post(`/api/revisions/${revision.id}/return`).send({ reason: 'late' });

    expect(approve.status).toBe(409);
    expect(approve.body.error.message).toBe('Revision 1 is withdrawn; only a revision in review can be approved.');
    expect(ret.status).toBe(409);
    expect(await designStatus(design.id)).toBe('draft');
  });
});

describe('POST /api/revisions/:id/return', () => {
  it('when a reviewer returns with a reason, then revision and design are returned, the designer is mailed the reason, and it is logged', async () => {
    const { design, revision } = await submitted();
    const reason = 'Lower the planned acceleration: the ringing check fails at 5000 mm/s².';

    const res = await agents.reviewer.post(`/api/revisions/${revision.id}/return`).send({ reason: `  ${reason}  ` });
    const mail = await waitForMail(emails.owner, `Returned: ${design.name}`);
    const history = await agents.owner.get(`/api/designs/${design.id}/revisions`);

    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'returned', returnReason: reason, decidedBy: { id: users.reviewer.id } });
    expect(await designStatus(design.id)).toBe('returned');
    expect(mail.text).toContain(reason);
    expect(mail.html).toContain('Lower the planned acceleration');
    expect(mail.text).toContain(`${getConfig().appUrl}/designs/${design.id}`);
    expect(history.body.items).toEqual([expect.objectContaining({ id: revision.id, status: 'returned', returnReason: reason })]);
    expect((await auditOf('design', design.id)).at(-1)).toEqual({
      action: 'design.return',
      actorId: users.reviewer.id,
      from: 'in_review',
      to: 'returned',
      reason,
    });
    expect((await auditOf('revision', revision.id)).at(-1)).toEqual({
      action: 'revision.return',
      actorId: users.reviewer.id,
      from: 'in_review',
      to: 'returned',
      reason,
    });
  });

  it.each([
    [{}, 'is required: say what the designer should change'],
    [{ reason: '' }, 'is required: say what the designer should change'],
    [{ reason: '   ' }, 'is required: say what the designer should change'],
    [{ reason: 42 }, 'is required: say what the designer should change'],
  ])('when the reason is %j, then 400 naming reason and the revision stays in review', async (body, message) => {
    const { design, revision } = await submitted();

    const res = await agents.reviewer.post(`/api/revisions/${revision.id}/return`).send(body);

    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'reason', message }]);
    expect(await designStatus(design.id)).toBe('in_review');
  });

  it.each(['maker', 'owner', 'otherDesigner'] as const)('when %s returns a revision, then 403', async (who) => {
    const { design, revision } = await submitted();
    const res = await agents[who].post(`/api/revisions/${revision.id}/return`).send({ reason: 'no' });
    expect(res.status).toBe(403);
    expect(await designStatus(design.id)).toBe('in_review');
  });

  it('when a reviewer returns their own work, then 403', async () => {
    const { revision } = await submitted('dual');
    const res = await agents.dual.post(`/api/revisions/${revision.id}/return`).send({ reason: 'mine' });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toBe('You cannot return your own work; withdraw it instead.');
  });

  it('when a returned revision is returned again or approved, then 409', async () => {
    const { revision } = await submitted();
    await agents.reviewer.post(`/api/revisions/${revision.id}/return`).send({ reason: 'first' });

    const again = await agents.reviewer2.post(`/api/revisions/${revision.id}/return`).send({ reason: 'second' });
    const approve = await agents.reviewer2.post(`/api/revisions/${revision.id}/approve`).send({});

    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe('Revision 1 is returned; only a revision in review can be returned.');
    expect(approve.status).toBe(409);
  });

  it('when the designer fixes a returned design and submits again, then revision 2 with a diff of the changed input and results', async () => {
    const { design, revision } = await submitted();
    await agents.reviewer.post(`/api/revisions/${revision.id}/return`).send({ reason: 'Use 32 microsteps.' });
    const edited = { ...design.inputs, driver: { ...design.inputs.driver, microsteps: 32 } };
    const patch = await agents.owner.patch(`/api/designs/${design.id}`).send({ inputs: edited, version: 1 });

    const second = await agents.owner.post(`/api/designs/${design.id}/submit`).send({ version: patch.body.version });
    const diff = await agents.reviewer.get(`/api/revisions/${second.body.id}/diff`);

    expect(patch.status).toBe(200);
    expect(second.status).toBe(201);
    expect(second.body).toMatchObject({ number: 2, status: 'in_review', previousRevisionId: revision.id });
    expect(diff.status).toBe(200);
    expect(diff.body.previous).toEqual({ id: revision.id, number: 1, status: 'returned', engineVersion: ENGINE_VERSION });
    expect(diff.body.engineVersion).toBe(ENGINE_VERSION);
    expect(diff.body.inputs).toEqual([{ path: 'driver.microsteps', change: 'changed', old: design.inputs.driver.microsteps, new: 32 }]);
    const steps = diff.body.results.find((r: { key: string }) => r.key === 'drive.stepsPerMm');
    const before = evaluateDesign(design.inputs).drive.stepsPerMm;
    const after = evaluateDesign(parseDesign(edited)).drive.stepsPerMm;
    expect(steps).toMatchObject({ label: 'Steps per mm of belt', unit: 'steps/mm', isChanged: true });
    expect(steps.old).toBeCloseTo(before, 9);
    expect(steps.new).toBeCloseTo(after, 9);
    expect(after / before).toBeCloseTo(32 / design.inputs.driver.microsteps, 9);
    const travel = diff.body.results.find((r: { key: string }) => r.key === 'travel.xMm');
    expect(travel.isChanged).toBe(false);
  });
});

describe('GET /api/revisions/:id/diff', () => {
  it('when a revision is the design’s first, then every input is new and there is no previous revision', async () => {
    const { design, revision } = await submitted();

    const res = await agents.reviewer.get(`/api/revisions/${revision.id}/diff`);

    expect(res.status).toBe(200);
    expect(res.body.previous).toBeNull();
    expect(res.body.inputs.length).toBeGreaterThan(20);
    expect(res.body.inputs.every((c: { change: string; old: unknown }) => c.change === 'added' && c.old === null)).toBe(true);
    expect(res.body.inputs).toContainEqual({ path: 'belt.pitchMm', change: 'added', old: null, new: design.inputs.belt.pitchMm });
    expect(res.body.results.every((r: { isChanged: boolean; old: unknown }) => r.isChanged && r.old === null)).toBe(true);
  });
});

describe('POST /api/revisions/:id/approve (refusals)', () => {
  it('when a reviewer approves their own work, then 403 "You cannot approve your own work"', async () => {
    const { design, revision } = await submitted('dual');

    const res = await agents.dual.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'looks great' });

    expect(res.status).toBe(403);
    expect(res.body.error).toEqual({ code: 'forbidden', message: 'You cannot approve your own work.' });
    expect(await designStatus(design.id)).toBe('in_review');
  });

  it('when an admin approves a revision they submitted, then 403 too', async () => {
    const design = await draft();
    const sub = await agents.admin.post(`/api/designs/${design.id}/submit`).send({});
    const res = await agents.admin.post(`/api/revisions/${sub.body.id}/approve`).send({});
    expect(res.status).toBe(403);
  });

  it.each(['maker', 'owner', 'otherDesigner', 'noRole'] as const)('when %s approves, then 403 and nothing changes', async (who) => {
    const { design, revision } = await submitted();
    const res = await agents[who].post(`/api/revisions/${revision.id}/approve`).send({ comment: 'ok' });
    expect(res.status).toBe(403);
    expect(await designStatus(design.id)).toBe('in_review');
  });

  it('when signed out, then 401; when the revision does not exist, then 404', async () => {
    const { revision } = await submitted();
    expect((await anonymous.post(`/api/revisions/${revision.id}/approve`).send({})).status).toBe(401);
    expect((await agents.reviewer.post('/api/revisions/2147483000/approve').send({})).status).toBe(404);
  });

  it('when the comment is too long or not text, then 400 naming comment', async () => {
    const { revision } = await submitted();
    const long = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'x'.repeat(2001) });
    const notText = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 5 });
    expect(long.status).toBe(400);
    expect(long.body.error.details).toEqual([{ path: 'comment', message: 'must be at most 2000 characters' }]);
    expect(notText.body.error.details).toEqual([{ path: 'comment', message: 'must be text' }]);
  });
});

describe('approval over a failed check (issue 13)', () => {
  /** 20-tooth pulleys under a belt whose smallest pulley is 24 teeth: only the pulley check fails (H-bot: no warnings). */
  // One failed check and nothing else: a fast controller and a stout motor shaft keep the second layer's step-rate
  // and shaft-load checks quiet.
  const tooSmallPulley = (d: DesignInput): DesignInput => ({
    ...d,
    mechanism: 'hbot',
    belt: { ...d.belt, minPulleyTeeth: 24 },
    controller: { ...d.controller, maxStepRateHz: 400000 },
    radialLoadRating: { ...d.radialLoadRating, motorShaftN: 150 },
  });

  it('when a revision with a failed check is approved without a justification, then 400 names justification and nothing changes', async () => {
    // Arrange
    const { design, revision } = await submitted('owner', tooSmallPulley);

    // Act
    const res = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'ok' });
    const blank = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'ok', justification: '   ' });

    // Assert
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toEqual([
      { path: 'justification', message: expect.stringMatching(/^is required: 1 check of this revision failed/) },
    ]);
    expect(blank.status).toBe(400);
    expect(await designStatus(design.id)).toBe('in_review');
    expect((await Revision.findByPk(revision.id))?.status).toBe('in_review');
  });

  it('when it is approved with a justification, then the justification is stored, logged with the failed check, mailed and on the sheet', async () => {
    // Arrange
    const { design, revision } = await submitted('owner', tooSmallPulley);
    const justification = 'The 8-tooth pulley is a stop-gap for the trial run; the 12-tooth pulley is on order.';

    // Act
    const res = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'Trial only.', justification });

    // Assert: state
    expect(res.status).toBe(200);
    expect(res.body.revision).toMatchObject({ status: 'approved', approvalComment: 'Trial only.', approvalJustification: justification });
    expect(res.body.sheet).toMatchObject({ justification, checks: { fail: 1 } });
    // Assert: audit names the failed check and carries the justification
    const log = await auditOf('design', design.id);
    expect(log.at(-1)).toMatchObject({ action: 'design.approve', to: 'approved' });
    expect(log.at(-1)!.reason).toContain('Approved with 1 failed check (pulley-min-teeth)');
    expect(log.at(-1)!.reason).toContain(justification);
    // Assert: the designer's mail quotes it
    const mail = await waitForMail(emails.owner, `Approved: ${design.name}`);
    expect(mail.text).toContain(justification);
  });

  it('when a revision without a failed check is approved with a justification, then it is not kept (nothing to justify)', async () => {
    const { revision } = await submitted('owner', (d) => ({ ...d, mechanism: 'hbot' }));
    const res = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ justification: 'not needed' });
    expect(res.status).toBe(200);
    expect(res.body.revision.approvalJustification).toBeNull();
  });

  it('when the justification is too long or not text, then 400 naming justification', async () => {
    const { revision } = await submitted('owner', tooSmallPulley);
    const long = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ justification: 'x'.repeat(4001) });
    const notText = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ justification: 7 });
    expect(long.body.error.details).toEqual([{ path: 'justification', message: 'must be at most 4000 characters' }]);
    expect(notText.body.error.details).toEqual([{ path: 'justification', message: 'must be text' }]);
  });

  it('when the reviewers are mailed about a submission with a failed check, then the mail says how many checks failed', async () => {
    const { design } = await submitted('owner', tooSmallPulley);
    const mail = await waitForMail(emails.reviewer, `Review requested: ${design.name}`);
    expect(mail.subject).toContain('(1 failed check)');
    expect(mail.text).toContain('1 failed check and no warning');
  });
});

describe('sheet units chosen at submission (issue 13)', () => {
  it('when a designer submits with sheetUnits imperial, then the revision and its sheet say imperial', async () => {
    // Arrange
    const design = await draft('owner', (d) => ({ ...d, mechanism: 'hbot' }));
    // Act
    const sub = await agents.owner.post(`/api/designs/${design.id}/submit`).send({ sheetUnits: 'imperial' });
    const approved = await agents.reviewer.post(`/api/revisions/${sub.body.id}/approve`).send({});
    // Assert
    expect(sub.status).toBe(201);
    expect(sub.body.sheetUnits).toBe('imperial');
    expect(approved.body.sheet.units).toBe('imperial');
  });

  it('when sheetUnits is not a unit system, then 400 names it', async () => {
    const design = await draft();
    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({ sheetUnits: 'furlongs' });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'sheetUnits', message: 'must be one of metric, imperial' }]);
  });
});

describe('approval end to end', () => {
  it('when a reviewer approves, then the design is approved with a sheet, the designer and makers are mailed, and every later transition is refused', async () => {
    // Arrange
    const { design, revision } = await submitted();
    await agents.reviewer.post(`/api/revisions/${revision.id}/comments`).send({ body: 'Checked the tension targets.' });

    // Act
    const res = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'Fine to build.' });

    // Assert: state
    expect(res.status).toBe(200);
    expect(res.body.revision).toMatchObject({
      id: revision.id,
      status: 'approved',
      approvalComment: 'Fine to build.',
      decidedBy: { id: users.reviewer.id },
    });
    expect(res.body.sheet).toMatchObject({
      revisionId: revision.id,
      revisionNumber: 1,
      approvedBy: { id: users.reviewer.id },
      comment: 'Fine to build.',
      isSuperseded: false,
    });
    expect(res.body.revision.sheetId).toBe(res.body.sheet.id);
    expect(await designStatus(design.id)).toBe('approved');
    // Assert: mail
    const toDesigner = await waitForMail(emails.owner, `Approved: ${design.name}`);
    const toMaker = await waitForMail(emails.maker, `New design sheet: ${design.name}`);
    expect(toDesigner.text).toContain(`${getConfig().appUrl}/sheets/${res.body.sheet.id}`);
    expect(toDesigner.text).toContain('Fine to build.');
    expect(toMaker.text).toContain(`${getConfig().appUrl}/sheets/${res.body.sheet.id}`);
    expect(toMaker.text).toContain(res.body.sheet.sha256);
    expect(
      (await fetchOutbox(emails.reviewer2)).filter((m) => m.subject.startsWith('Approved') && m.subject.includes(design.name)),
    ).toEqual([]);
    // Assert: audit
    const designLog = await auditOf('design', design.id);
    expect(designLog.at(-1)).toEqual({
      action: 'design.approve',
      actorId: users.reviewer.id,
      from: 'in_review',
      to: 'approved',
      reason: 'Fine to build.',
    });
    expect(await auditOf('sheet', res.body.sheet.id)).toEqual([
      {
        action: 'sheet.publish',
        actorId: users.reviewer.id,
        from: null,
        to: 'published',
        reason: expect.stringContaining(res.body.sheet.sha256),
      },
    ]);
    const adminLog = await agents.admin.get(`/api/audit?entity=design&entityId=${design.id}`);
    expect(adminLog.body.items.map((e: { action: string }) => e.action)).toEqual(['design.approve', 'design.submit']);

    // Assert: nothing further may change the approved revision
    const again = await agents.reviewer2.post(`/api/revisions/${revision.id}/approve`).send({});
    const ret = await agents.reviewer2.post(`/api/revisions/${revision.id}/return`).send({ reason: 'too late' });
    const withdraw = await agents.owner.post(`/api/designs/${design.id}/withdraw`).send({});
    const resubmit = await agents.owner.post(`/api/designs/${design.id}/submit`).send({});
    const edit = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'edited', version: 1 });
    expect([again.status, ret.status, withdraw.status, resubmit.status, edit.status]).toEqual([409, 409, 409, 409, 409]);
    expect(resubmit.body.error.message).toBe('This design is approved; only a draft or a returned design can be submitted.');
    // Makers may now read the approved revision.
    expect((await agents.maker.get(`/api/revisions/${revision.id}`)).status).toBe(200);
  });
});

describe('reading revisions', () => {
  it.each([
    ['owner', 200],
    ['reviewer', 200],
    ['admin', 200],
    ['maker', 403],
    ['otherDesigner', 403],
    ['noRole', 403],
  ] as const)('when %s reads a revision in review, then %i', async (who, status) => {
    const { revision } = await submitted();
    const res = await agents[who].get(`/api/revisions/${revision.id}`);
    expect(res.status).toBe(status);
    if (status === 403 && who !== 'noRole')
      expect(res.body.error.message).toBe('Only reviewers, admins and the design’s owner can read a revision before it is approved.');
    // fix: #12 — an account without a role is refused at the door, before the revision rule.
    if (who === 'noRole') expect(res.body.error.code).toBe('forbidden');
  });

  it('when a reviewer lists revisions in review, then the oldest comes first and makers and designers are refused', async () => {
    const first = await submitted();
    const second = await submitted();

    const res = await agents.reviewer.get('/api/revisions?status=in_review&pageSize=100');
    const ids = res.body.items.map((r: { id: number }) => r.id);
    const mine = res.body.items.find((r: { id: number }) => r.id === first.revision.id);

    expect(res.status).toBe(200);
    expect(ids.indexOf(first.revision.id)).toBeGreaterThanOrEqual(0);
    expect(ids.indexOf(first.revision.id)).toBeLessThan(ids.indexOf(second.revision.id));
    const times = res.body.items.map((r: { submittedAt: string }) => Date.parse(r.submittedAt));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    expect(res.body.items.every((r: { status: string }) => r.status === 'in_review')).toBe(true);
    expect(mine).toMatchObject({ number: 1, design: { id: first.design.id, owner: { id: users.owner.id } }, isOwn: false });
    expect(mine).not.toHaveProperty('result');
    expect((await agents.maker.get('/api/revisions')).status).toBe(403);
    expect((await agents.owner.get('/api/revisions')).status).toBe(403);
    const bad = await agents.reviewer.get('/api/revisions?status=pending');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('status');
  });

  it('when a reviewer reads their own revision, then it says they cannot decide it', async () => {
    const { revision } = await submitted('dual');
    const res = await agents.dual.get(`/api/revisions/${revision.id}`);
    expect(res.body).toMatchObject({ isOwn: true, permissions: { canDecide: false, canComment: true } });
    const other = await agents.reviewer.get(`/api/revisions/${revision.id}`);
    expect(other.body).toMatchObject({ isOwn: false, permissions: { canDecide: true, canComment: true, canWithdraw: false } });
  });
});

describe('comments', () => {
  it('when a reviewer comments and the owner replies, then the thread lists both with the reply under the comment', async () => {
    const { revision } = await submitted();

    const first = await agents.reviewer.post(`/api/revisions/${revision.id}/comments`).send({ body: 'Why 20-tooth pulleys?' });
    const reply = await agents.owner
      .post(`/api/revisions/${revision.id}/comments`)
      .send({ body: 'Resolution: 0.0125 mm per microstep.', parentId: first.body.id });
    const list = await agents.reviewer.get(`/api/revisions/${revision.id}/comments`);

    expect(first.status).toBe(201);
    expect(reply.status).toBe(201);
    expect(list.status).toBe(200);
    expect(list.body.items).toEqual([
      {
        id: first.body.id,
        revisionId: revision.id,
        parentId: null,
        author: { id: users.reviewer.id, name: users.reviewer.name, roles: ['reviewer'] },
        body: 'Why 20-tooth pulleys?',
        createdAt: expect.any(String),
      },
      {
        id: reply.body.id,
        revisionId: revision.id,
        parentId: first.body.id,
        author: { id: users.owner.id, name: users.owner.name, roles: ['designer'] },
        body: 'Resolution: 0.0125 mm per microstep.',
        createdAt: expect.any(String),
      },
    ]);
  });

  it.each(['maker', 'otherDesigner', 'noRole'] as const)('when %s comments, then 403 and nothing is stored', async (who) => {
    const { revision } = await submitted();
    const res = await agents[who].post(`/api/revisions/${revision.id}/comments`).send({ body: 'hello' });
    const list = await agents.reviewer.get(`/api/revisions/${revision.id}/comments`);
    expect(res.status).toBe(403);
    expect(list.body.items).toEqual([]);
  });

  it('when the body is empty or the parent is on another revision, then 400 naming the field', async () => {
    const a = await submitted();
    const b = await submitted();
    const other = await agents.reviewer.post(`/api/revisions/${b.revision.id}/comments`).send({ body: 'on b' });

    const empty = await agents.reviewer.post(`/api/revisions/${a.revision.id}/comments`).send({ body: '  ' });
    const wrongParent = await agents.reviewer
      .post(`/api/revisions/${a.revision.id}/comments`)
      .send({ body: 'reply', parentId: other.body.id });

    expect(empty.status).toBe(400);
    expect(empty.body.error.details).toEqual([{ path: 'body', message: 'must not be empty' }]);
    expect(wrongParent.status).toBe(400);
    expect(wrongParent.body.error.details).toEqual([{ path: 'parentId', message: 'is not a comment on this revision' }]);
  });
});

describe('revisions frozen by an older engine', () => {
  it('when a revision frozen by engine 1 is read, diffed and approved, then its result stays as frozen and its sheet prints it', async () => {
    // Arrange: an in-review revision whose result engine 1 froze (shaped as that engine stored it)
    const design = await draft();
    const inputs = parseDesign(design.inputs);
    const result = engineOneResult(inputs);
    const now = new Date();
    const revision = await Revision.create({
      designId: design.id,
      number: 1,
      status: 'in_review',
      inputs: inputs as unknown as Record<string, unknown>,
      result: result as unknown as Record<string, unknown>,
      summary: summaryFigures(result),
      engineVersion: '1.0.0',
      fingerprint: revisionFingerprint(inputs, result),
      authorId: users.owner.id,
      submittedAt: now,
      decidedById: null,
      decidedAt: null,
      decisionNote: null,
    });
    await Design.update({ status: 'in_review' }, { where: { id: design.id } });

    // Act
    const read = await agents.reviewer.get(`/api/revisions/${revision.id}`);
    const diff = await agents.reviewer.get(`/api/revisions/${revision.id}/diff`);
    const approve = await agents.reviewer.post(`/api/revisions/${revision.id}/approve`).send({ comment: 'Approved as computed then.' });

    // Assert: nothing was recomputed with the current engine
    expect(read.status).toBe(200);
    expect(read.body.engineVersion).toBe('1.0.0');
    expect(read.body.result.engineVersion).toBe('1.0.0');
    expect(read.body.result.drive.microstep).toBeUndefined();
    // engine 1 stored the microstep as one number (the fixture keeps that shape under today's result type)
    expect(read.body.result.drive.microstepMm).toEqual((result.drive as unknown as { microstepMm: number }).microstepMm);
    expect(read.body.result.belts[0].tension).toBeUndefined();
    expect(diff.status).toBe(200);
    expect(diff.body.engineVersion).toBe('1.0.0');
    expect(diff.body.results.find((r: { key: string }) => r.key === 'drive.microstep.axisMm').new).toBeNull();
    expect(approve.status).toBe(200);
    expect(approve.body.sheet).toMatchObject({ revisionId: revision.id, engineVersion: '1.0.0' });
    const after = await Revision.findByPk(revision.id);
    expect(after?.fingerprint).toBe(revisionFingerprint(inputs, result));
  });
});

describe('immutability of revisions', () => {
  it.each(['put', 'patch', 'delete'] as const)(
    'when anyone sends %s to a revision, then 404 and the revision is unchanged',
    async (method) => {
      const { revision } = await submitted();
      const before = await Revision.findByPk(revision.id);

      const asAdmin = await agents.admin[method](`/api/revisions/${revision.id}`).send({ status: 'approved', inputs: {} });
      const asOwner = await agents.owner[method](`/api/revisions/${revision.id}`).send({ inputs: {} });
      const commentEdit = await agents.admin[method](`/api/revisions/${revision.id}/comments`).send({ body: 'x' });

      expect([asAdmin.status, asOwner.status, commentEdit.status]).toEqual([404, 404, 404]);
      const after = await Revision.findByPk(revision.id);
      expect(after?.get({ plain: true })).toEqual(before?.get({ plain: true }));
    },
  );

  it('when the database is asked to change a frozen column, then the trigger refuses it (review state may still move)', async () => {
    const { revision } = await submitted();

    // fix: start each query only after the previous rejection is handled, or a fast second failure is unhandled.
    await expect(
      getSequelize().query("UPDATE revisions SET inputs = JSON_SET(inputs, '$.name', 'forged') WHERE id = ?", {
        replacements: [revision.id],
      }),
    ).rejects.toThrow(/frozen/);
    await expect(
      getSequelize().query('UPDATE revisions SET fingerprint = ? WHERE id = ?', { replacements: ['0'.repeat(64), revision.id] }),
    ).rejects.toThrow(/frozen/);
    const row = await Revision.findByPk(revision.id);
    expect(row?.fingerprint).toBe(revision.fingerprint);
  });
});

describe('mail failures', () => {
  it('when the mail to a reviewer cannot be delivered, then the submit still succeeds, the mail waits in the queue with its error, and a retry delivers it', async () => {
    // Arrange: a reviewer whose mail the SMTP side refuses for now
    const flaky = await createUser({ roles: ['reviewer'] });
    failing.addresses.add(flaky.email);
    const design = await draft();

    // Act
    const res = await agents.owner.post(`/api/designs/${design.id}/submit`).send({});

    // Assert: the transition stands
    expect(res.status).toBe(201);
    expect(await designStatus(design.id)).toBe('in_review');
    let row: Notification | null = null;
    for (let i = 0; i < 200; i += 1) {
      row = await Notification.findOne({ where: { toAddress: flaky.email, subject: { [Op.like]: `%${design.name}%` } } });
      if (row && row.attempts > 0) break;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    expect(row).toMatchObject({ status: 'pending', attempts: 1, kind: 'revision.submitted' });
    expect(row!.lastError).toMatch(/SMTP/);
    expect(row!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());
    // The other reviewers were not held up by it.
    await waitForMail(emails.reviewer, `${design.name}, revision 1`);

    // Act: the SMTP side recovers and the retry falls due
    failing.addresses.delete(flaky.email);
    await Notification.update({ nextAttemptAt: new Date(Date.now() - 1000) }, { where: { id: row!.id } });
    await deliverQueuedMail();

    // Assert
    const mail = await waitForMail(flaky.email, `${design.name}, revision 1`);
    expect(mail.text).toContain(`/review/${res.body.id}`);
    const sent = await Notification.findByPk(row!.id);
    expect(sent).toMatchObject({ status: 'sent', attempts: 2 });
  });

  it('when a second process already claimed a mail, then a retry pass does not send it twice', async () => {
    const rcpt = await createUser({ roles: ['reviewer'] });
    const design = await draft();
    failing.addresses.add(rcpt.email);
    await agents.owner.post(`/api/designs/${design.id}/submit`).send({});
    let row: Notification | null = null;
    for (let i = 0; i < 200 && !(row && row.attempts > 0); i += 1) {
      row = await Notification.findOne({ where: { toAddress: rcpt.email, subject: { [Op.like]: `%${design.name}%` } } });
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    failing.addresses.delete(rcpt.email);
    // Due, but held by another process for another minute.
    await Notification.update(
      { nextAttemptAt: new Date(Date.now() - 1000), lockedUntil: new Date(Date.now() + 60_000) },
      { where: { id: row!.id } },
    );

    await deliverQueuedMail();

    expect(await Notification.findByPk(row!.id)).toMatchObject({ status: 'pending', attempts: 1 });
    expect((await fetchOutbox(rcpt.email)).filter((m) => m.subject.includes(design.name))).toEqual([]);
  });
});

describe('GET /api/designs/:id/revisions', () => {
  it('when others read the history of a design, then they see only what they may read', async () => {
    const { design, revision } = await submitted();

    const owner = await agents.owner.get(`/api/designs/${design.id}/revisions`);
    const maker = await agents.maker.get(`/api/designs/${design.id}/revisions`);
    const missing = await agents.owner.get('/api/designs/2147483000/revisions');

    expect(owner.status).toBe(200);
    expect(owner.body.items.map((r: { id: number }) => r.id)).toEqual([revision.id]);
    expect(maker.status).toBe(200);
    expect(maker.body.items).toEqual([]);
    expect(missing.status).toBe(404);
  });
});
