import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createMemoryHistory, createRouter } from 'vue-router';
import { createPinia } from 'pinia';
import type { RevisionDetail } from '@/api/revisions';
import type { Check } from '@/engine';
import ReviewDecision from '@/views/review/ReviewDecision.vue';

vi.setConfig({ testTimeout: 60_000 });

type DoneArgs = [string, string, (ok: boolean) => void];
type ReturnArgs = [string, (ok: boolean) => void];

/** A failed check in the shape the engine gives, with its message as parts. */
const FAILED: Check = {
  id: 'cruise-speed',
  severity: 'fail',
  message: 'Cruise speed 0.60 m/s is above the highest speed in the worst direction (0.51 m/s).',
  parts: [
    'Cruise speed ',
    { value: 0.6, kind: 'speedMPerS' },
    ' is above the highest speed in the worst direction (',
    { value: 0.512, kind: 'speedMPerS' },
    ').',
  ],
  value: 0.6,
  limit: 0.512,
  unit: 'm/s',
  kind: 'speedMPerS',
  subject: null,
};
// Stored by an older engine: a check without its message parts.
const WARNED = {
  ...FAILED,
  id: 'torque-margin',
  severity: 'warn',
  message: 'The design uses 75 % of the torque.',
  parts: undefined,
} as unknown as Check;

function revision(extra: Partial<RevisionDetail> = {}): RevisionDetail {
  return {
    id: 31,
    designId: 7,
    number: 2,
    status: 'in_review',
    name: 'Bench stage',
    mechanism: 'corexy',
    design: { id: 7, name: 'Bench stage', status: 'in_review', owner: { id: 3, name: 'Dana Designer' } },
    author: { id: 3, name: 'Dana Designer' },
    submittedAt: '2026-03-01T10:00:00Z',
    decidedBy: null,
    decidedAt: null,
    returnReason: null,
    approvalComment: null,
    approvalJustification: null,
    sheetUnits: 'metric',
    sheetId: null,
    engineVersion: '1.0.0',
    fingerprint: 'cd'.repeat(32),
    summary: {
      checks: { ok: 10, warn: 0, fail: 0 },
      stepsPerMm: 80,
      travel: { xMm: 300, yMm: 300 },
      worstAccelMPerS2: 12,
      lowestFrequencyHz: 40,
    },
    isOwn: false,
    inputs: {} as RevisionDetail['inputs'],
    result: { checks: [] as Check[] } as RevisionDetail['result'],
    previousRevisionId: 30,
    permissions: { canDecide: true, canComment: true, canWithdraw: false },
    ...extra,
  };
}

async function mountDecision(rev: RevisionDetail) {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: { template: '<div />' } },
      { path: '/sheets/:id', name: 'sheet', component: { template: '<div />' } },
    ],
  });
  await router.push('/');
  const wrapper = mount(ReviewDecision, {
    props: { revision: rev, isDeciding: false },
    global: { plugins: [router, createPinia()] },
    attachTo: document.body,
  });
  await flushPromises();
  return wrapper;
}

/** The dialogs are teleported to the body, outside the wrapper. */
const inBody = <T extends Element = HTMLElement>(selector: string) => document.body.querySelector<T>(selector);

/** Whether the dialog's overlay is shown (Element Plus hides it with display: none). */
const isOpen = (test: string) => (inBody(`[data-test="${test}"]`)?.closest<HTMLElement>('.el-overlay')?.style.display ?? 'none') !== 'none';

describe('ReviewDecision', () => {
  it('when the revision is the user’s own work, then approve and return are hidden and the reason is explained', async () => {
    // Arrange / Act
    const wrapper = await mountDecision(revision({ isOwn: true, permissions: { canDecide: false, canComment: true, canWithdraw: true } }));
    // Assert
    expect(wrapper.find('[data-test="review-approve"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="review-return"]').exists()).toBe(false);
    expect(wrapper.get('[data-test="review-own-work"]').text()).toContain('This is your own work');
    expect(wrapper.find('[data-test="review-withdraw"]').exists()).toBe(true);
    wrapper.unmount();
  });

  it('when a reviewer may decide, then approve and return are offered and withdraw is not', async () => {
    const wrapper = await mountDecision(revision());
    expect(wrapper.find('[data-test="review-approve"]').exists()).toBe(true);
    expect(wrapper.find('[data-test="review-return"]').exists()).toBe(true);
    expect(wrapper.find('[data-test="review-own-work"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="review-withdraw"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when return is confirmed without a reason, then a reason is demanded and nothing is emitted', async () => {
    // Arrange
    const wrapper = await mountDecision(revision());
    await wrapper.get('[data-test="review-return"]').trigger('click');
    await flushPromises();
    // Act
    inBody<HTMLButtonElement>('[data-test="return-confirm"]')!.click();
    await flushPromises();
    // Assert
    expect(wrapper.emitted('return')).toBeUndefined();
    expect(inBody('[data-test="return-reason"]')!.closest('.el-form-item')!.classList).toContain('is-error');
    await vi.waitFor(() =>
      expect(inBody('[data-test="return-dialog"] .el-form-item__error')?.textContent).toContain('a reason is required'),
    );
    wrapper.unmount();
  });

  it('when return is confirmed with a reason, then return is emitted with it and the dialog closes once stored', async () => {
    // Arrange
    const wrapper = await mountDecision(revision());
    await wrapper.get('[data-test="review-return"]').trigger('click');
    await flushPromises();
    const textarea = inBody<HTMLTextAreaElement>('textarea[data-test="return-reason"]')!;
    textarea.value = 'Raise the belt pretension to the sheet value.';
    textarea.dispatchEvent(new Event('input'));
    await flushPromises();
    // Act
    inBody<HTMLButtonElement>('[data-test="return-confirm"]')!.click();
    await flushPromises();
    // Assert
    const returned = wrapper.emitted('return') as ReturnArgs[];
    expect(returned).toHaveLength(1);
    expect(returned[0][0]).toBe('Raise the belt pretension to the sheet value.');
    expect(isOpen('return-dialog')).toBe(true);
    returned[0][1](true);
    await flushPromises();
    expect(isOpen('return-dialog')).toBe(false);
    wrapper.unmount();
  });

  it('when approve is confirmed, then approve is emitted with the comment', async () => {
    const wrapper = await mountDecision(revision());
    await wrapper.get('[data-test="review-approve"]').trigger('click');
    await flushPromises();
    const textarea = inBody<HTMLTextAreaElement>('textarea[data-test="approve-comment"]')!;
    textarea.value = 'Good margins.';
    textarea.dispatchEvent(new Event('input'));
    await flushPromises();
    inBody<HTMLButtonElement>('[data-test="approve-confirm"]')!.click();
    await flushPromises();
    const approved = wrapper.emitted('approve') as DoneArgs[];
    expect(approved).toHaveLength(1);
    expect(approved[0][0]).toBe('Good margins.');
    expect(approved[0][1]).toBe('');
    approved[0][2](false);
    await flushPromises();
    expect(isOpen('approve-dialog')).toBe(true);
    wrapper.unmount();
  });

  it('when a check failed, then the dialog lists it in the reviewer’s units and refuses to approve without a justification (issue 13)', async () => {
    // Arrange
    const wrapper = await mountDecision(
      revision({
        summary: { ...revision().summary, checks: { ok: 8, warn: 1, fail: 1 } },
        result: { checks: [WARNED, FAILED] } as unknown as RevisionDetail['result'],
      }),
    );
    expect(wrapper.get('[data-test="decide-fail-note"]').text()).toContain('1 failed check');
    await wrapper.get('[data-test="review-approve"]').trigger('click');
    await flushPromises();
    // Act: confirm with no justification
    inBody<HTMLButtonElement>('[data-test="approve-confirm"]')!.click();
    await flushPromises();
    // Assert: nothing emitted, the failed check comes first with its message in mm/s, and the field asks for a reason
    expect(wrapper.emitted('approve')).toBeUndefined();
    const items = [...document.body.querySelectorAll('[data-test="approve-check"]')];
    expect(items.map((i) => i.getAttribute('data-severity'))).toEqual(['fail', 'warn']);
    expect(items[0].textContent).toContain('Cruise speed 600\u00a0mm/s is above the highest speed in the worst direction (512\u00a0mm/s).');
    await vi.waitFor(() =>
      expect(inBody('[data-test="approve-dialog"] .el-form-item__error')?.textContent).toContain('Justification is required'),
    );
    expect(inBody('[data-test="approve-counts"]')!.textContent).toContain('1 failed');

    // Act: with a justification
    const textarea = inBody<HTMLTextAreaElement>('textarea[data-test="approve-justification"]')!;
    textarea.value = 'Cruise speed is a target; the job planner caps it per direction.';
    textarea.dispatchEvent(new Event('input'));
    await flushPromises();
    inBody<HTMLButtonElement>('[data-test="approve-confirm"]')!.click();
    await flushPromises();
    // Assert
    const approved = wrapper.emitted('approve') as DoneArgs[];
    expect(approved).toHaveLength(1);
    expect(approved[0][1]).toBe('Cruise speed is a target; the job planner caps it per direction.');
    wrapper.unmount();
  });

  it('when the revision was returned, then the outcome shows the reviewer and the reason', async () => {
    const wrapper = await mountDecision(
      revision({
        status: 'returned',
        decidedBy: { id: 4, name: 'Rui Reviewer' },
        decidedAt: '2026-03-02T09:30:00Z',
        returnReason: 'Motor current too high.',
      }),
    );
    expect(wrapper.get('[data-test="review-outcome"]').text()).toContain('Rui Reviewer');
    expect(wrapper.get('[data-test="review-return-reason"]').text()).toBe('Motor current too high.');
    expect(wrapper.find('[data-test="review-approve"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when the revision was approved with a sheet, then it links to that sheet', async () => {
    const wrapper = await mountDecision(
      revision({ status: 'approved', decidedBy: { id: 4, name: 'Rui Reviewer' }, decidedAt: '2026-03-02T09:30:00Z', sheetId: 55 }),
    );
    expect(wrapper.get('[data-test="review-sheet-link"]').attributes('href')).toBe('/sheets/55');
    wrapper.unmount();
  });
});
