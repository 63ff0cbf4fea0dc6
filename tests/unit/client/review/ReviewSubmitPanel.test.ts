import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { DesignStatus } from '@/api/designs';
import type { RevisionDetail, RevisionListItem, RevisionStatus } from '@/api/revisions';
import type { Role, User } from '@/api/types';
import type { Check } from '@/engine';
import ReviewSubmitPanel from '@/views/review/ReviewSubmitPanel.vue';

vi.mock('@/api/revisions', () => ({
  listDesignRevisions: vi.fn(),
  submitDesign: vi.fn(),
  withdrawDesign: vi.fn(),
  reopenDesign: vi.fn(),
}));
vi.mock('@/utils/message', () => ({
  confirmAction: vi.fn(),
  showSuccess: vi.fn(),
  showError: vi.fn(),
}));
const api = vi.mocked(await import('@/api/revisions'));
const message = vi.mocked(await import('@/utils/message'));

vi.setConfig({ testTimeout: 60_000 });

function revision(number: number, status: RevisionStatus, extra: Partial<RevisionListItem> = {}): RevisionListItem {
  return {
    id: 100 + number,
    designId: 7,
    number,
    status,
    name: 'Bench stage',
    mechanism: 'corexy',
    design: { id: 7, name: 'Bench stage', status: 'draft', owner: { id: 3, name: 'Dana Designer' } },
    author: { id: 3, name: 'Dana Designer' },
    submittedAt: '2026-03-01T10:00:00Z',
    decidedBy: status === 'in_review' ? null : { id: 4, name: 'Rui Reviewer' },
    decidedAt: status === 'in_review' ? null : '2026-03-02T09:30:00Z',
    returnReason: null,
    approvalComment: null,
    approvalJustification: null,
    sheetUnits: 'metric',
    sheetId: null,
    engineVersion: '1.0.0',
    fingerprint: 'ab'.repeat(32),
    summary: {
      checks: { ok: 10, warn: 0, fail: 0 },
      stepsPerMm: 80,
      travel: { xMm: 300, yMm: 300 },
      worstAccelMPerS2: 12,
      lowestFrequencyHz: 40,
    },
    isOwn: true,
    ...extra,
  };
}

const page = (items: RevisionListItem[]) => ({ items, total: items.length, page: 1, pageSize: 20 });

interface MountOptions {
  status: DesignStatus;
  canChange?: boolean;
  prepare?: () => Promise<number | undefined>;
  roles?: Role[];
  checks?: Check[] | null;
}

const check = (id: string, severity: Check['severity'], message: string): Check => ({
  id,
  severity,
  message,
  value: 1,
  limit: 2,
  unit: 'N',
  kind: 'forceN',
  parts: [message],
  subject: null,
});

/** The submit dialog is teleported to the body, outside the wrapper. */
const inBody = <T extends Element = HTMLElement>(selector: string) => document.body.querySelector<T>(selector);

async function mountPanel({ status, canChange = true, prepare, roles = ['designer'], checks = null }: MountOptions) {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: { template: '<div />' } },
      { path: '/sheets/:id', name: 'sheet', component: { template: '<div />' } },
      { path: '/review/:revisionId', name: 'review', component: { template: '<div />' } },
    ],
  });
  await router.push('/');
  const user: User = {
    id: 3,
    email: 'dana@example.test',
    name: 'Dana Designer',
    roles,
    disabled: false,
    isInvited: false,
    createdAt: '2026-01-01T00:00:00Z',
  };
  const pinia = createTestingPinia({ createSpy: vi.fn, stubActions: false, initialState: { auth: { user, isLoaded: true } } });
  const wrapper = mount(ReviewSubmitPanel, {
    props: { designId: 7, status, canChange, prepare, checks },
    global: { plugins: [router, pinia] },
    attachTo: document.body,
  });
  await flushPromises();
  return wrapper;
}

describe('ReviewSubmitPanel', () => {
  beforeEach(() => {
    vi.resetAllMocks();
    api.listDesignRevisions.mockResolvedValue(page([]));
  });

  it('when a draft is submitted and confirmed, then prepare() runs first and its version goes to the submit API, then changed is emitted', async () => {
    // Arrange
    const order: string[] = [];
    const prepare = vi.fn(async () => {
      order.push('prepare');
      return 12;
    });
    api.submitDesign.mockImplementation(async () => {
      order.push('submit');
      return {} as RevisionDetail;
    });
    const wrapper = await mountPanel({ status: 'draft', prepare });
    // Act
    await wrapper.get('[data-test="design-submit"]').trigger('click');
    await flushPromises();
    inBody<HTMLButtonElement>('[data-test="submit-confirm"]')!.click();
    await flushPromises();
    // Assert
    expect(order).toEqual(['prepare', 'submit']);
    expect(api.submitDesign).toHaveBeenCalledWith(7, 12, 'metric');
    expect(wrapper.emitted('changed')).toHaveLength(1);
    expect(message.showSuccess).toHaveBeenCalled();
    // the history is reloaded after the submit
    expect(api.listDesignRevisions).toHaveBeenCalledTimes(2);
    wrapper.unmount();
  });

  it('when the dialog opens, then its title counts on from the newest revision', async () => {
    api.listDesignRevisions.mockResolvedValue(page([revision(2, 'returned'), revision(1, 'returned')]));
    const wrapper = await mountPanel({ status: 'returned' });
    await wrapper.get('[data-test="design-submit"]').trigger('click');
    await flushPromises();
    expect(inBody('[data-test="submit-dialog"]')!.textContent).toContain('Submit revision 3 for review?');
    wrapper.unmount();
  });

  it('when the design has failed checks and warnings, then the dialog lists them, failures first (issue 13)', async () => {
    // Arrange
    const checks = [
      check('torque-margin', 'warn', 'The design uses 75 % of the available torque.'),
      check('pulley-min-teeth', 'fail', 'An 8-tooth pulley is smaller than the belt’s minimum of 12 teeth.'),
      check('cruise-speed', 'ok', 'Cruise speed is reachable in every direction.'),
    ];
    const wrapper = await mountPanel({ status: 'draft', checks });
    // Act
    await wrapper.get('[data-test="design-submit"]').trigger('click');
    await flushPromises();
    // Assert
    expect(inBody('[data-test="submit-counts"]')!.textContent).toContain('1 failed check, 1 warning');
    const items = [...document.body.querySelectorAll('[data-test="submit-check"]')];
    expect(items.map((i) => i.getAttribute('data-severity'))).toEqual(['fail', 'warn']);
    expect(items[0].textContent).toContain('8-tooth pulley');
    expect(items[1].textContent).toContain('75 %');
    wrapper.unmount();
  });

  it('when the designer cancels the dialog, then nothing is prepared or submitted and nothing is emitted', async () => {
    // Arrange
    const prepare = vi.fn(async () => 5);
    const wrapper = await mountPanel({ status: 'draft', prepare });
    // Act
    await wrapper.get('[data-test="design-submit"]').trigger('click');
    await flushPromises();
    [...document.body.querySelectorAll<HTMLButtonElement>('[data-test="submit-dialog"] .el-dialog__footer button')]
      .find((b) => b.textContent?.includes('Cancel'))!
      .click();
    await flushPromises();
    // Assert
    expect(prepare).not.toHaveBeenCalled();
    expect(api.submitDesign).not.toHaveBeenCalled();
    expect(wrapper.emitted('changed')).toBeUndefined();
    wrapper.unmount();
  });

  it('when the submit API refuses, then the error is shown and changed is not emitted', async () => {
    const failure = new Error('The design changed since you loaded it.');
    api.submitDesign.mockRejectedValue(failure);
    const wrapper = await mountPanel({ status: 'draft' });
    await wrapper.get('[data-test="design-submit"]').trigger('click');
    await flushPromises();
    inBody<HTMLButtonElement>('[data-test="submit-confirm"]')!.click();
    await flushPromises();
    expect(api.submitDesign).toHaveBeenCalledWith(7, undefined, 'metric');
    expect(message.showError).toHaveBeenCalledWith(failure, 'The design could not be submitted.');
    expect(wrapper.emitted('changed')).toBeUndefined();
    wrapper.unmount();
  });

  it('when the latest revision was returned, then its reason and reviewer are shown above the bar', async () => {
    // Arrange
    api.listDesignRevisions.mockResolvedValue(
      page([
        revision(2, 'returned', { returnReason: 'Belt pretension is above the allowable working tension.' }),
        revision(1, 'returned', { returnReason: 'Older reason that must not show.' }),
      ]),
    );
    // Act
    const wrapper = await mountPanel({ status: 'returned' });
    // Assert
    expect(api.listDesignRevisions).toHaveBeenCalledWith(7);
    expect(wrapper.get('[data-test="return-reason-text"]').text()).toBe('Belt pretension is above the allowable working tension.');
    expect(wrapper.get('[data-test="returned-banner"]').text()).toContain('Rui Reviewer');
    expect(wrapper.get('[data-test="returned-banner"]').text()).toContain('revision 2');
    wrapper.unmount();
  });

  it('when the newest revision is approved although an older one was returned, then no return reason is shown', async () => {
    api.listDesignRevisions.mockResolvedValue(
      page([revision(2, 'approved'), revision(1, 'returned', { returnReason: 'Fix the motor current.' })]),
    );
    const wrapper = await mountPanel({ status: 'approved' });
    expect(wrapper.find('[data-test="return-reason-text"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when the user may not change the design, then no submit, withdraw or reopen button is offered', async () => {
    api.listDesignRevisions.mockResolvedValue(page([revision(1, 'returned', { returnReason: 'Too slack.' })]));
    const wrapper = await mountPanel({ status: 'returned', canChange: false });
    expect(wrapper.find('[data-test="design-submit"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="design-withdraw"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="design-reopen"]').exists()).toBe(false);
    // the reason is still visible to read
    expect(wrapper.get('[data-test="return-reason-text"]').text()).toBe('Too slack.');
    wrapper.unmount();
  });

  it.each<[DesignStatus, string, string[]]>([
    ['draft', 'design-submit', ['design-withdraw', 'design-reopen']],
    ['returned', 'design-submit', ['design-withdraw', 'design-reopen']],
    ['in_review', 'design-withdraw', ['design-submit', 'design-reopen']],
    ['approved', 'design-reopen', ['design-submit', 'design-withdraw']],
  ])('when the design is %s, then only %s is offered', async (status, shown, hidden) => {
    const wrapper = await mountPanel({ status });
    expect(wrapper.find(`[data-test="${shown}"]`).exists()).toBe(true);
    for (const h of hidden) expect(wrapper.find(`[data-test="${h}"]`).exists()).toBe(false);
    wrapper.unmount();
  });

  it('when a design in review is withdrawn and confirmed, then the withdraw API is called and changed is emitted', async () => {
    // Arrange
    api.listDesignRevisions.mockResolvedValue(page([revision(1, 'in_review')]));
    api.withdrawDesign.mockResolvedValue({} as RevisionDetail);
    message.confirmAction.mockResolvedValue(true);
    const wrapper = await mountPanel({ status: 'in_review' });
    // Act
    await wrapper.get('[data-test="design-withdraw"]').trigger('click');
    await flushPromises();
    // Assert
    expect(api.withdrawDesign).toHaveBeenCalledWith(7);
    expect(api.submitDesign).not.toHaveBeenCalled();
    expect(wrapper.emitted('changed')).toHaveLength(1);
    wrapper.unmount();
  });

  it('when an approved design is reopened and confirmed, then the reopen API is called and changed is emitted', async () => {
    api.reopenDesign.mockResolvedValue({ id: 7, status: 'draft' });
    message.confirmAction.mockResolvedValue(true);
    const wrapper = await mountPanel({ status: 'approved' });
    await wrapper.get('[data-test="design-reopen"]').trigger('click');
    await flushPromises();
    expect(api.reopenDesign).toHaveBeenCalledWith(7);
    expect(wrapper.emitted('changed')).toHaveLength(1);
    wrapper.unmount();
  });

  it('when revisions exist, then the history lists them with sheet links, and review links only for reviewers', async () => {
    // Arrange
    api.listDesignRevisions.mockResolvedValue(page([revision(2, 'approved', { sheetId: 55 }), revision(1, 'returned')]));
    // Act
    const designer = await mountPanel({ status: 'approved', roles: ['designer'] });
    const reviewer = await mountPanel({ status: 'approved', roles: ['reviewer'] });
    // Assert
    expect(designer.get('[data-test="revision-history-toggle"]').text()).toBe('2 revisions');
    expect(designer.findAll('[data-test="revision-history"] li')).toHaveLength(2);
    expect(designer.find('a[href="/sheets/55"]').exists()).toBe(true);
    expect(designer.find('a[href="/review/102"]').exists()).toBe(false);
    expect(reviewer.find('a[href="/review/102"]').exists()).toBe(true);
    designer.unmount();
    reviewer.unmount();
  });
});
