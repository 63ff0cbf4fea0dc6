import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

/** Types a value into a Design desk input and waits until the autosave has stored it (or refused it). */
async function typeAndWaitForSave(page: Page, designId: number, path: string, value: string): Promise<number> {
  const saved = page.waitForResponse((r) => r.url().endsWith(`/api/designs/${designId}`) && r.request().method() === 'PATCH');
  await page.fill(`[data-test="input-${path}"]`, value);
  return (await saved).status();
}

describe('two people editing one design', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when a designer and an admin both change the same draft, then the later save meets the conflict dialog, and "Load their version" shows the other change', async () => {
    // Arrange: the designer's draft, open on two Design desks.
    const designer = await openPage(browser(), { baseURL, height: 1000 });
    const admin = await openPage(browser(), { baseURL, height: 1000 });
    await designer.page.goto('/sign-in');
    await signInThroughForm(designer.page, 'designer@example.test');
    await admin.page.goto('/sign-in');
    await signInThroughForm(admin.page, 'admin@example.test');
    const created = await designer.page.request.post('/api/designs', {
      data: { template: 'hbot', name: `Shared stage ${Date.now().toString(36)}` },
    });
    const designId = ((await created.json()) as { id: number }).id;
    for (const p of [designer.page, admin.page]) {
      await p.goto(`/designs/${designId}`);
      await p.waitForSelector('[data-test="tab-summary"]');
    }

    // Act: the admin saves first; the designer, still on version 1, saves afterwards.
    expect(await typeAndWaitForSave(admin.page, designId, 'pretensionN', '52')).toBe(200);
    expect(await typeAndWaitForSave(designer.page, designId, 'pretensionN', '47')).toBe(409);

    // Assert: the designer is asked what to do, and taking the other version shows the admin's 52 N.
    const dialog = designer.page.locator('[data-test="conflict-dialog"]');
    await dialog.waitFor();
    await designer.page.click('[data-test="conflict-theirs"]');
    await dialog.waitFor({ state: 'hidden' });
    await designer.page.waitForFunction(
      () => (document.querySelector('[data-test="input-pretensionN"]') as HTMLInputElement | null)?.value === '52',
    );
    const stored = (await (await designer.page.request.get(`/api/designs/${designId}`)).json()) as { inputs: { pretensionN: number } };
    expect(stored.inputs.pretensionN).toBe(52);

    expect([...designer.pageErrors, ...admin.pageErrors]).toEqual([]);
    await Promise.all([designer.context.close(), admin.context.close()]);
  });
});
