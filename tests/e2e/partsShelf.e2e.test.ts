import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

/** Types into the number box of a part field of the open dialog. */
async function fillPart(page: Page, key: string, value: string): Promise<void> {
  await page.fill(`[data-test="part-field-${key}"] input`, value);
}

describe('Parts shelf journey: a new motor with its torque table', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when an admin adds a motor and uploads its torque table with what it was measured at, then a designer who picks it is warned that the design drives it differently', async () => {
    const name = `42 mm trial motor ${Date.now().toString(36)}`;
    const admin = await openPage(browser(), { baseURL, height: 1000 });
    const designer = await openPage(browser(), { baseURL, height: 1000 });

    // Act 1: the admin adds a motor through the dialog.
    await admin.page.goto('/sign-in');
    await signInThroughForm(admin.page, 'admin@example.test');
    await admin.page.goto('/parts?shelf=motors');
    await admin.page.click('[data-test="part-add"]');
    await admin.page.waitForSelector('[data-test="part-dialog"]');
    await admin.page.fill('[data-test="part-field-name"] input', name);
    for (const [key, value] of [
      ['frameMm', '42'],
      ['stepAngleDeg', '1.8'],
      ['holdingTorqueNm', '0.48'],
      ['ratedCurrentA', '2'],
      ['phaseResistanceOhm', '1.4'],
      ['phaseInductanceMh', '2.6'],
      ['rotorInertiaKgM2', '60'], // g·cm² in metric
      ['massKg', '330'], // g
    ] as const)
      await fillPart(admin.page, key, value);
    await admin.page.click('[data-test="part-save"]');
    const row = admin.page.locator(`[data-test="part-row"][data-name="${name}"]`);
    await row.waitFor();

    // Act 2: the admin uploads its torque table: without the measured-at values the file is not sent.
    const motorId = Number(
      ((await (await admin.page.request.get(`/api/parts/motors?q=${encodeURIComponent(name)}`)).json()) as { items: { id: number }[] })
        .items[0].id,
    );
    await admin.page.click(`[data-test="torque-table-open-${motorId}"]`);
    await admin.page.waitForSelector('[data-test="torque-dialog"] [data-test="torque-status"]');
    const csv = {
      name: 'trial-motor.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('speed_rpm,torque_Ncm\n0,45\n300,38\n600,28\n900,18\n'),
    };
    await admin.page.setInputFiles('[data-test="torque-upload"] input[type="file"]', csv);
    await admin.page.waitForSelector('[data-test="torque-measured-error"]');
    await admin.page.fill('[data-test="torque-measured-supply"] input', '36');
    await admin.page.fill('[data-test="torque-measured-current"] input', '2');
    await admin.page.setInputFiles('[data-test="torque-upload"] input[type="file"]', csv);

    // Assert 1: the shelf shows the table with its conditions.
    await admin.page.waitForSelector('[data-test="torque-conditions"]:has-text("36 V")');
    expect(await admin.page.textContent('[data-test="torque-status"]')).toContain('4 points');
    expect(await admin.page.textContent('[data-test="torque-conditions"]')).toMatch(/36 V.*2 A/s);

    // Act 3: a designer starts a design (24 V, 1.2 A on the driver) and picks the motor on the Design desk.
    await designer.page.goto('/sign-in');
    await signInThroughForm(designer.page, 'designer@example.test');
    const created = await designer.page.request.post('/api/designs', {
      data: { template: 'hbot', name: `Trial motor stage ${Date.now().toString(36)}` },
    });
    const designId = ((await created.json()) as { id: number }).id;
    await designer.page.goto(`/designs/${designId}`);
    await designer.page.waitForSelector('[data-test="tab-summary"]');
    await designer.page.click('[data-test="pick-motor"]');
    await designer.page.click(`.el-select-dropdown__item:has-text("${name}")`);

    // Assert 2: the desk says so beside the motor and in the checks.
    const note = designer.page.locator('[data-test="torque-table-note"]');
    await note.waitFor();
    expect(await note.getAttribute('data-mismatch')).toBe('yes');
    expect((await note.textContent())?.replace(/\u00a0/g, ' ')).toContain('measured at 36 V, 2 A');
    await designer.page.click('[data-test="tab-checks-label"]');
    const check = designer.page.locator('[data-test="check-torque-table-conditions"]');
    await check.waitFor();
    expect(await check.getAttribute('data-severity')).toBe('warn');
    expect((await check.locator('[data-test="check-message"]').textContent())?.replace(/\u00a0/g, ' ')).toContain(
      'this design drives it at 24 V',
    );

    expect([...admin.pageErrors, ...designer.pageErrors]).toEqual([]);
    await Promise.all([admin.context.close(), designer.context.close()]);
  });
});
