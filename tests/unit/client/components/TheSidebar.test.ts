import { describe, expect, it, vi } from 'vitest';
import { mount, RouterLinkStub } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import type { Role } from '@/api/types';
import TheSidebar from '@/components/TheSidebar.vue';

function mountSidebar(roles: Role[], isOutboxEnabled: boolean, waiting: number | null = null) {
  return mount(TheSidebar, {
    global: {
      plugins: [
        createTestingPinia({
          createSpy: vi.fn,
          initialState: {
            auth: {
              user: { id: 1, email: 'x@example.test', name: 'X', roles, disabled: false, createdAt: '2025-01-01T00:00:00Z' },
              isLoaded: true,
            },
            health: { health: { status: 'ok', db: 'up', version: '0.1.0', outbox: isOutboxEnabled } },
            reviewQueue: { waiting },
          },
        }),
      ],
      stubs: { RouterLink: RouterLinkStub },
    },
  });
}

const navKeys = (wrapper: ReturnType<typeof mountSidebar>): string[] =>
  wrapper.findAll('[data-test^="nav-"]').map((el) => el.attributes('data-test')!.replace('nav-', ''));

describe('TheSidebar', () => {
  it.each<[string, Role[], boolean, string[]]>([
    ['admin', ['admin'], true, ['designs', 'review', 'sheets', 'parts', 'team', 'outbox']],
    ['admin where the outbox is off (production)', ['admin'], false, ['designs', 'review', 'sheets', 'parts', 'team']],
    ['designer', ['designer'], true, ['designs', 'sheets', 'parts']],
    ['reviewer', ['reviewer'], true, ['designs', 'review', 'sheets', 'parts']],
    ['maker', ['maker'], true, ['sheets', 'parts']],
    ['designer who also builds', ['designer', 'maker'], true, ['designs', 'sheets', 'parts']],
    // fix: #12 — an account without a role sees nothing of the team (the server refuses it all).
    ['user without any role', [], true, []],
  ])('when the user is %s, then shows exactly the allowed navigation items', (_who, roles, outbox, expected) => {
    // Arrange + Act
    const wrapper = mountSidebar(roles, outbox);
    // Assert
    expect(navKeys(wrapper)).toEqual(expected);
  });

  it('when rendering an item, then links it to its screen with a readable label', () => {
    const wrapper = mountSidebar(['reviewer'], false);
    const links = wrapper.findAllComponents(RouterLinkStub);
    const review = links.find((l) => l.attributes('data-test') === 'nav-review')!;
    expect(review.props('to')).toBe('/review');
    expect(review.text()).toBe('Review desk');
  });

  it('when revisions wait for review, then the Review desk item shows how many, in words for screen readers (issue 13)', () => {
    // Arrange + Act
    const wrapper = mountSidebar(['reviewer'], false, 3);
    // Assert
    const count = wrapper.get('[data-test="review-waiting-count"]');
    expect(count.attributes('data-count')).toBe('3');
    expect(count.text()).toContain('3 revisions waiting');
  });

  it('when nothing waits, then the Review desk item shows no count', () => {
    const wrapper = mountSidebar(['reviewer'], false, 0);
    expect(wrapper.find('[data-test="review-waiting-count"]').exists()).toBe(false);
  });

  it('when the server reports a version, then shows it', () => {
    const wrapper = mountSidebar(['maker'], false);
    expect(wrapper.get('[data-test="app-version"]').text()).toBe('v0.1.0');
  });
});
