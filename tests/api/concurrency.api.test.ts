import type { Server } from 'node:http';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize, getSequelize, TransactionMisuseError } from '../../server/db';
import { AuditLog, Design, Revision, Sheet, User } from '../../server/models';
import { closePools, warmPools } from '../../server/workers/pool';
import { createDesign, createUser, signIn, type Agent } from '../helpers/factories';

// This file is about locks and pooled connections, not about how long a PDF takes: the renderer (the PDF worker
// pool, which a module mock of the renderer itself cannot reach inside its threads) answers with a tiny fixed
// document so that the 2 s below measures waiting, not rendering (sheets.api.test.ts renders real sheets; the
// rendering time has its benchmark and worker pool, issue 11).
vi.mock('../../server/workers/pool', async (importOriginal) => {
  const { createHash } = await import('node:crypto');
  const pdf = Buffer.from('%PDF-1.4\n% concurrency test sheet\n%%EOF\n');
  const sha256 = createHash('sha256').update(pdf).digest('hex');
  return {
    ...(await importOriginal<typeof import('../../server/workers/pool')>()),
    renderSheetsInPool: async () => ({ a4: pdf, a4Sha256: sha256, letter: pdf, letterSha256: sha256 }),
  };
});

/** Every answer must come within this; a stalled pool used to answer 503 after 20 s (issue 12, item 2). */
const ANSWER_TIMEOUT_MS = 2000;
/** 20 requests at once: half submit one draft, half approve one revision (twice the pool's 10 connections). */
const SUBMITS = 10;
const APPROVALS = 10;

const app = createApp();
let server: Server;
let owner: Agent;
let reviewer: Agent;
let anonymous: ReturnType<typeof request.agent>;

beforeAll(async () => {
  // As startServer does: the engine thread that freezes a submitted revision is loaded before the first request.
  await warmPools();
  server = app.listen(0, '127.0.0.1');
  const designer = await createUser({ roles: ['designer'] });
  const checker = await createUser({ roles: ['reviewer'] });
  owner = await signIn(server as never, designer.email, designer.password);
  reviewer = await signIn(server as never, checker.email, checker.password);
  anonymous = request.agent(server);
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await closePools();
  await closeSequelize();
});

/** The status of an answer, or 'timeout' when none came within ANSWER_TIMEOUT_MS. */
async function statusOf(call: request.Test): Promise<number | 'timeout'> {
  try {
    return (await call.timeout({ response: ANSWER_TIMEOUT_MS, deadline: ANSWER_TIMEOUT_MS })).status;
  } catch (err) {
    if ((err as { timeout?: number }).timeout) return 'timeout';
    throw err;
  }
}

const count = (statuses: (number | 'timeout')[], wanted: number | 'timeout') => statuses.filter((s) => s === wanted).length;

describe('concurrent transitions', () => {
  // fix: #12 — 12 concurrent submits held every pooled connection; three answered 503 after 20 s and health went 503.
  it('when 10 submits of one draft and 10 approvals of one revision arrive at once, then each answers within 2 s: one of each wins, the rest get 409', async () => {
    // Arrange
    const designerId = (await owner.get('/api/auth/me')).body.user.id as number;
    const toSubmit = await createDesign({ owner: { id: designerId } as never });
    const toApprove = await createDesign({ owner: { id: designerId } as never });
    const submitted = await owner.post(`/api/designs/${toApprove.id}/submit`).send({});
    expect(submitted.status).toBe(201);
    const revisionId = submitted.body.id as number;

    // Act
    const calls = [
      ...Array.from({ length: SUBMITS }, () => statusOf(owner.post(`/api/designs/${toSubmit.id}/submit`).send({}))),
      ...Array.from({ length: APPROVALS }, () => statusOf(reviewer.post(`/api/revisions/${revisionId}/approve`).send({ comment: 'ok' }))),
      statusOf(anonymous.get('/api/health')),
    ];
    const statuses = await Promise.all(calls);
    const submits = statuses.slice(0, SUBMITS);
    const approvals = statuses.slice(SUBMITS, SUBMITS + APPROVALS);
    const health = statuses[SUBMITS + APPROVALS];

    // Assert: the answers
    expect(submits.filter((s) => s === 'timeout' || s >= 500)).toEqual([]);
    expect(approvals.filter((s) => s === 'timeout' || s >= 500)).toEqual([]);
    expect(count(submits, 201)).toBe(1);
    expect(count(submits, 409)).toBe(SUBMITS - 1);
    expect(count(approvals, 200)).toBe(1);
    expect(count(approvals, 409)).toBe(APPROVALS - 1);
    expect(health).toBe(200);
    // Assert: the state — one revision, one sheet, one logged transition each
    expect((await Design.findByPk(toSubmit.id))!.status).toBe('in_review');
    expect(await Revision.count({ where: { designId: toSubmit.id } })).toBe(1);
    expect(await AuditLog.count({ where: { action: 'design.submit', entityId: toSubmit.id } })).toBe(1);
    expect((await Design.findByPk(toApprove.id))!.status).toBe('approved');
    expect((await Revision.findByPk(revisionId))!.status).toBe('approved');
    expect(await Sheet.count({ where: { revisionId } })).toBe(1);
    expect(await AuditLog.count({ where: { action: 'design.approve', entityId: toApprove.id } })).toBe(1);
  });

  it('when a request is refused because another holds the design, then the answer says so with code busy', async () => {
    // Arrange
    const designerId = (await owner.get('/api/auth/me')).body.user.id as number;
    const design = await createDesign({ owner: { id: designerId } as never });
    // Act
    const answers = await Promise.all(Array.from({ length: 6 }, () => owner.post(`/api/designs/${design.id}/submit`).send({})));
    // Assert
    const refused = answers.filter((a) => a.status === 409).map((a) => a.body.error.code);
    expect(answers.filter((a) => a.status === 201)).toHaveLength(1);
    expect(refused.length).toBe(5);
    expect(refused.every((code) => code === 'busy' || code === 'invalid_state')).toBe(true);
  });
});

describe('the transaction guard', () => {
  it('when code inside a transaction queries without it or opens another, then it is refused (under NODE_ENV=test)', async () => {
    // Arrange
    const sequelize = getSequelize();
    // Act (settled together, so no rejection waits unhandled while another is awaited)
    const [outside, nested, meant, inside] = await Promise.allSettled([
      sequelize.transaction(async () => User.count()),
      sequelize.transaction(async () => sequelize.transaction(async () => 1)),
      sequelize.transaction(async () => User.count({ transaction: null })),
      sequelize.transaction(async (transaction) => User.count({ transaction })),
    ]);
    // Assert
    expect(outside.status === 'rejected' && outside.reason).toBeInstanceOf(TransactionMisuseError);
    expect(nested.status === 'rejected' && nested.reason).toBeInstanceOf(TransactionMisuseError);
    expect(meant.status === 'fulfilled' && meant.value).toBeGreaterThan(0);
    expect(inside.status === 'fulfilled' && inside.value).toBeGreaterThan(0);
  });
});
