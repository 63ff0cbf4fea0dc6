import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

type Mail = { to: string[]; subject: string; text: string };

/** The newest caught mail to `address` whose subject contains `subject` (mail goes out in the background). */
async function mailTo(admin: Page, address: string, subject: string): Promise<Mail> {
  for (let attempt = 0; attempt < 60; attempt += 1) {
    const res = await admin.request.get('/api/outbox?pageSize=100');
    if (!res.ok()) throw new Error(`the Outbox answered ${res.status()}: ${await res.text()}`);
    const found = ((await res.json()) as { items: Mail[] }).items.find(
      (m) => m.to.some((t) => t.includes(address)) && m.subject.toLowerCase().includes(subject.toLowerCase()),
    );
    if (found) return found;
    await admin.waitForTimeout(250);
  }
  throw new Error(`No mail "${subject}" to ${address} was caught.`);
}

/** The app link with a token in a mail ("/reset?token=…"). */
const resetPath = (mail: Mail): string => {
  const link = /https?:\/\/\S+\/reset\?token=[A-Za-z0-9_-]+\S*/.exec(mail.text)?.[0];
  if (!link) throw new Error(`no reset link in: ${mail.text}`);
  const url = new URL(link);
  return `${url.pathname}${url.search}`;
};

describe('forgot and reset password journey', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when someone forgets their password, then the e-mailed link sets a new one, they are signed in, and the old password no longer works', async () => {
    // Arrange: a person with a password of their own (invited, then set through the invitation link).
    const email = `forgetful.${Date.now().toString(36)}@example.test`;
    const admin = await openPage(browser(), { baseURL });
    await admin.page.goto('/sign-in');
    await signInThroughForm(admin.page, 'admin@example.test');
    expect((await admin.page.request.post('/api/users', { data: { email, name: 'Fen Forgetful', roles: ['maker'] } })).status()).toBe(201);
    const invite = resetPath(await mailTo(admin.page, email, 'invited'));
    const tokenOf = (path: string) => new URL(path, baseURL).searchParams.get('token');
    // A throw-away context of its own: setting a password signs that context in.
    const setup = await openPage(browser(), { baseURL });
    const set = await setup.page.request.post('/api/auth/reset', { data: { token: tokenOf(invite), password: 'the first password 1' } });
    expect(set.status()).toBe(200);
    await setup.context.close();
    const person = await openPage(browser(), { baseURL, width: 390, height: 844 });

    // Act 1: "Forgot password?" from the sign-in page.
    await person.page.goto('/sign-in');
    await person.page.click('[data-test="forgot-link"]');
    await person.page.fill('[data-test="forgot-email"]', email);
    await person.page.click('[data-test="forgot-submit"]');
    await person.page.waitForSelector('[data-test="forgot-sent"]');

    // Act 2: the link from the mail, a new password.
    const link = resetPath(await mailTo(admin.page, email, 'password'));
    await person.page.goto(link);
    await person.page.fill('[data-test="reset-password"]', 'a brand new password 2');
    await person.page.fill('[data-test="reset-confirm"]', 'a brand new password 2');
    await person.page.click('[data-test="reset-submit"]');

    // Assert: signed in as the maker; the old password is refused, the new one works.
    await person.page.waitForURL((url) => url.pathname === '/sheets');
    const old = await admin.page.request.fetch('/api/auth/login', {
      method: 'POST',
      data: { email, password: 'the first password 1' },
      headers: {},
    });
    expect(old.status()).toBe(401);
    const fresh = await openPage(browser(), { baseURL });
    await fresh.page.goto('/sign-in');
    await signInThroughForm(fresh.page, email, 'a brand new password 2');
    expect(await fresh.page.textContent('[data-test="user-name"]')).toBe('Fen Forgetful');

    expect([...person.pageErrors, ...fresh.pageErrors]).toEqual([]);
    await Promise.all([admin.context.close(), person.context.close(), fresh.context.close()]);
  });
});
