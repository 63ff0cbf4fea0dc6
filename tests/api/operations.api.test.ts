import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findMariaDbServing, mariaDbPaths, startMariaDb, stopMariaDbInDir } from '../../scripts/db';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import { Measurement } from '../../server/models';
import { ROOT_DIR } from '../../server/paths';
import { synthWav, typicalPluck } from '../unit/server/uploads/synthRecording';
import { createApprovedSheet, createUser, signedInAs, type Agent } from '../helpers/factories';

/** Operations (issue 12, item 10): MariaDB restarts under npm start, superseded sheets, lying WAV headers. */
const app = createApp();
afterAll(() => closeSequelize());

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

const isListening = (port: number) =>
  new Promise<boolean>((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });

describe('stopping MariaDB after it was restarted', () => {
  // fix: #12 — after a restart, Ctrl-C said "Stopped MariaDB" while the new server kept running, and its pid file was
  // removed, so the next npm start failed on the port.
  it('when the instance npm start began with was replaced by a restarted one, then stop() stops the one running now', async () => {
    // Arrange: npm start's instance, stopped and started again by someone else (db:stop, then db.ts start).
    const dir = path.join(ROOT_DIR, '.data-test', `restart-${randomBytes(4).toString('hex')}`);
    const port = await freePort();
    const log = () => undefined;
    try {
      const first = await startMariaDb({ dir, port, log });
      await stopMariaDbInDir(dir, log);
      const second = await startMariaDb({ dir, port, log });
      expect(second.pid).not.toBe(first.pid);
      // Act
      const stopped = await first.stop();
      // Assert
      expect(stopped).toBe(second.pid);
      expect(findMariaDbServing(mariaDbPaths(dir).dataDir)).toBeNull();
      expect(await isListening(port)).toBe(false);
      expect(await first.stop()).toBe(stopped); // idempotent
    } finally {
      await stopMariaDbInDir(dir, log);
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);

  it('when nothing runs any more, then stop() says so (null) instead of claiming it stopped something', async () => {
    const dir = path.join(ROOT_DIR, '.data-test', `restart-${randomBytes(4).toString('hex')}`);
    const log = () => undefined;
    try {
      const handle = await startMariaDb({ dir, port: await freePort(), log });
      await stopMariaDbInDir(dir, log);
      expect(await handle.stop()).toBeNull();
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);
});

describe('measurements on a superseded sheet', () => {
  let maker: Agent;
  beforeAll(async () => {
    ({ agent: maker } = await signedInAs(app, ['maker']));
  });

  // fix: #12 — a measurement on a superseded sheet was stored, judged against targets the belts are no longer set to.
  it('when a later revision of the design was approved, then a measurement on the old sheet is refused with 409, typed or recorded', async () => {
    // Arrange: revision 1 approved; reopened, submitted and approved again as revision 2.
    const designer = await signedInAs(app, ['designer']);
    const reviewer = await signedInAs(app, ['reviewer']);
    const old = await createApprovedSheet({ owner: designer.user, approver: (await createUser({ roles: ['reviewer'] })).user });
    expect((await designer.agent.post(`/api/designs/${old.designId}/reopen`).send({})).status).toBe(200);
    const submitted = await designer.agent.post(`/api/designs/${old.designId}/submit`).send({});
    const approved = await reviewer.agent.post(`/api/revisions/${submitted.body.id}/approve`).send({ comment: 'second' });
    expect(approved.status).toBe(200);
    const spanId = old.result.belts[0].spans[0].id;
    const wav = synthWav({ sampleRateHz: 16000, durationS: 1, pluck: typicalPluck(120), seed: 3 });
    // Act
    const typed = await maker.post(`/api/sheets/${old.sheetId}/measurements`).send({ spanId, frequencyHz: 100 });
    const recorded = await maker.post(`/api/sheets/${old.sheetId}/measurements`).field('spanId', spanId).attach('file', wav, 'pluck.wav');
    const current = await maker.post(`/api/sheets/${approved.body.sheet.id}/measurements`).send({ spanId, frequencyHz: 100 });
    // Assert
    for (const res of [typed, recorded]) {
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('sheet_superseded');
      expect(res.body.error.message).toBe(
        `This sheet (revision 1) was superseded by revision 2. Record measurements on the current sheet (sheet ${approved.body.sheet.id}), whose targets the belts are set to.`,
      );
    }
    expect(await Measurement.count({ where: { sheetId: old.sheetId } })).toBe(0);
    expect(current.status).toBe(201);
  }, 120_000);
});

describe('a WAV whose header lies about its size', () => {
  // fix: #12 — a WAV whose RIFF header claimed 4 GB was accepted.
  it('when the header claims 4 GB, then the recording is refused with a clear 422 and nothing is stored', async () => {
    // Arrange
    const { agent: maker } = await signedInAs(app, ['maker']);
    const designer = await createUser({ roles: ['designer'] });
    const reviewer = await createUser({ roles: ['reviewer'] });
    const sheet = await createApprovedSheet({ owner: designer.user, approver: reviewer.user });
    const wav = synthWav({ sampleRateHz: 16000, durationS: 1, pluck: typicalPluck(120), seed: 4 });
    wav.writeUInt32LE(0xfffffff8, 4);
    // Act
    const res = await maker
      .post(`/api/sheets/${sheet.sheetId}/measurements`)
      .field('spanId', sheet.result.belts[0].spans[0].id)
      .attach('file', wav, 'pluck.wav');
    // Assert
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('recording_corrupt');
    expect(res.body.error.message).toMatch(/^The WAV header says the file holds 4\.0 GB, but it holds \d+ kB/);
    expect(await Measurement.count({ where: { sheetId: sheet.sheetId } })).toBe(0);
  });
});
