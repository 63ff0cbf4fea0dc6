import { randomBytes } from 'node:crypto';
import { Op } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { closeSequelize, getSequelize } from '../../server/db';
import { Notification } from '../../server/models';
import { claimDueMail, deliverQueuedMail, queueMail, queuedMessageId, type Recipient } from '../../server/services/notify.service';
import { fetchOutbox } from '../helpers/factories';

// The mail queue shared by any number of senders: rows are claimed with one conditional UPDATE carrying a random
// token and a lease, so each mail leaves once. The rows of these tests are queued an hour in the future, so the
// periodic passes of other test files never take them; the workers here name their rows explicitly.

const IN_AN_HOUR = () => new Date(Date.now() + 3_600_000);

async function queue(count: number, tag: string): Promise<{ ids: number[]; recipients: Recipient[] }> {
  const recipients = Array.from({ length: count }, (_, i) => ({ email: `mq-${tag}-${i}@example.test`, name: `Recipient ${i}` }));
  const ids = await getSequelize().transaction((transaction) =>
    queueMail(
      'test.bulk',
      recipients,
      (r) => ({ subject: `Queue test ${tag}: ${r.name}`, text: `Hello ${r.name}`, html: `<p>Hello ${r.name}</p>` }),
      transaction,
    ),
  );
  await Notification.update({ nextAttemptAt: IN_AN_HOUR() }, { where: { id: { [Op.in]: ids } } });
  return { ids, recipients };
}

/** One sender: claims up to 25 of `ids` at a time and sends them, until a pass finds nothing left to claim. */
async function worker(ids: number[]): Promise<number> {
  let sent = 0;
  for (;;) {
    const pass = await deliverQueuedMail({ ids, limit: 25 });
    if (pass.sent + pass.failed === 0) return sent;
    sent += pass.sent;
  }
}

afterAll(async () => {
  await closeSequelize();
});

describe('mail queue', () => {
  it('when three queue workers drain one queue of 500 mails at the same time, then every mail is sent exactly once', async () => {
    // Arrange
    const tag = randomBytes(4).toString('hex');
    const { ids, recipients } = await queue(500, tag);

    // Act
    const perWorker = await Promise.all([worker(ids), worker(ids), worker(ids)]);

    // Assert: the workers shared the work and sent 500 between them…
    expect(perWorker.reduce((a, b) => a + b, 0)).toBe(500);
    expect(perWorker.every((n) => n > 0)).toBe(true);
    // …every row is sent after one attempt…
    const rows = await Notification.findAll({ where: { id: { [Op.in]: ids } }, attributes: ['id', 'status', 'attempts', 'toAddress'] });
    expect(rows).toHaveLength(500);
    expect(rows.every((r) => r.status === 'sent' && r.attempts === 1)).toBe(true);
    // …and the mail catcher received each one exactly once, with the queue row's Message-ID.
    const caught = (await fetchOutbox()).filter((m) => m.subject.startsWith(`Queue test ${tag}:`));
    expect(caught).toHaveLength(500);
    const perRecipient = new Map<string, number>();
    for (const m of caught) for (const to of m.to) perRecipient.set(to, (perRecipient.get(to) ?? 0) + 1);
    expect(recipients.every((r) => perRecipient.get(r.email) === 1)).toBe(true);
    const expectedIds = new Set(rows.map((r) => queuedMessageId(r.id)));
    expect(new Set(caught.map((m) => m.messageId))).toEqual(expectedIds);
  });

  it('when a sender crashed while holding a mail, then once its lease ran out another sender sends it once', async () => {
    // Arrange: the first sender claims the mail and dies without sending it.
    const tag = randomBytes(4).toString('hex');
    const { ids, recipients } = await queue(1, tag);
    const crashed = await claimDueMail({ ids });
    const heldMeanwhile = await deliverQueuedMail({ ids });
    await Notification.update({ lockedUntil: new Date(Date.now() - 1000) }, { where: { id: ids[0] } });

    // Act
    const afterLease = await deliverQueuedMail({ ids });
    const again = await deliverQueuedMail({ ids });

    // Assert
    expect(crashed.rows.map((r) => r.id)).toEqual(ids);
    expect(heldMeanwhile).toEqual({ sent: 0, failed: 0, discarded: 0 });
    expect(afterLease).toEqual({ sent: 1, failed: 0, discarded: 0 });
    expect(again).toEqual({ sent: 0, failed: 0, discarded: 0 });
    const row = await Notification.findByPk(ids[0]);
    expect(row).toMatchObject({ status: 'sent', attempts: 1 });
    expect(row!.claimToken).not.toBe(crashed.token);
    expect(await fetchOutbox(recipients[0].email)).toHaveLength(1);
  });
});
