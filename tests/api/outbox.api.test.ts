import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { createUser, signedInAs, waitForMail, type Agent } from '../helpers/factories';

const app = createApp();
let admin: Agent;

beforeAll(async () => {
  ({ agent: admin } = await signedInAs(app, ['admin']));
});
afterAll(() => closeSequelize());

describe('GET /api/outbox', () => {
  it('when mail was sent, then the admin sees it with from, to, subject, date, text and html', async () => {
    const { email } = await createUser();
    await request(app).post('/api/auth/forgot').send({ email });
    await waitForMail(email, 'Reset');

    const res = await admin.get(`/api/outbox?to=${encodeURIComponent(email)}`);

    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ total: 1, page: 1, pageSize: 20 });
    const [message] = res.body.items;
    expect(message).toMatchObject({ from: getConfig().mailFrom, to: [email], subject: 'Reset your Gantrywright password' });
    expect(new Date(message.date).getTime()).not.toBeNaN();
    expect(message.text).toContain('expires in one hour');
    expect(message.html).toContain('<a href="');
  });

  it('when several mails exist, then they are listed newest first and paged', async () => {
    const { email } = await createUser();
    await request(app).post('/api/auth/forgot').send({ email });
    await waitForMail(email);
    await request(app).post('/api/auth/forgot').send({ email });
    const deadline = Date.now() + 10_000;
    let total = 0;
    while (total < 2 && Date.now() < deadline) total = (await admin.get(`/api/outbox?to=${encodeURIComponent(email)}`)).body.total;

    const page1 = await admin.get(`/api/outbox?to=${encodeURIComponent(email)}&pageSize=1`);
    const page2 = await admin.get(`/api/outbox?to=${encodeURIComponent(email)}&pageSize=1&page=2`);

    expect(page1.body.total).toBe(2);
    expect(page1.body.items).toHaveLength(1);
    expect(page2.body.items).toHaveLength(1);
    expect(page1.body.items[0].date >= page2.body.items[0].date).toBe(true);
    expect(page1.body.items[0].id).not.toBe(page2.body.items[0].id);
  });
});
