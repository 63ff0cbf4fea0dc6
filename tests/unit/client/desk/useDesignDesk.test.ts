import { beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, ref } from 'vue';
import { createPinia, setActivePinia } from 'pinia';
import { defaultDesign } from '@/engine';
import type { Design } from '@/api/designs';
import type { DesignEditable } from '@/contracts';
import { useAuthStore } from '@/stores/auth';
import { useDesignDesk } from '@/views/desk/useDesignDesk';

const getDesign = vi.fn();
vi.mock('@/api/designs', () => ({ getDesign: (id: number) => getDesign(id), updateDesign: vi.fn() }));

/** A design as GET /api/designs/:id answers it, owned by Dana, with what the server says of editing it. */
function designAnswer(editable: DesignEditable, status: Design['status'] = 'draft'): Design {
  return {
    id: 41,
    name: 'Bench stage',
    mechanism: 'corexy',
    status,
    owner: { id: 7, name: 'Dana Designer' },
    travel: { xMm: 300, yMm: 200 },
    version: 3,
    updatedAt: '2026-12-01T10:00:00.000Z',
    createdAt: '2026-12-01T09:00:00.000Z',
    canOpen: true,
    canEdit: editable.ok,
    canDelete: editable.ok,
    inputs: defaultDesign('corexy'),
    editable,
    updatedBy: null,
    latestResultSummary: null,
  };
}

/** Opens design 41 on the desk as an admin (whose roles alone would allow editing any draft). */
async function openAsAdmin(answer: Design) {
  getDesign.mockResolvedValueOnce(answer);
  useAuthStore().setUser({
    id: 1,
    name: 'Ada Admin',
    email: 'ada@example.test',
    roles: ['admin'],
    disabled: false,
    isInvited: false,
    createdAt: '2026-11-30T08:00:00.000Z',
  });
  const scope = effectScope();
  const desk = scope.run(() => useDesignDesk(ref(41)))!;
  await vi.waitFor(() => expect(desk.isLoading.value).toBe(false));
  return { desk, scope };
}

describe('useDesignDesk', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    getDesign.mockReset();
  });

  it('when the server says the design belongs to someone else, then the desk is read-only with that reason, whatever the roles', async () => {
    // Arrange / Act
    const { desk, scope } = await openAsAdmin(designAnswer({ ok: false, reason: 'not_owner' }));
    desk.set('belt.widthMm', 9);

    // Assert
    expect(desk.canEdit.value).toBe(false);
    expect(desk.readOnlyReason.value).toBe('This design belongs to Dana Designer; only the owner or an admin may change it.');
    expect(desk.get('belt.widthMm')).toBe(defaultDesign('corexy').belt.widthMm);
    scope.stop();
  });

  it('when the server says an approved design may be reopened by the asker, then the reason says to start a new revision', async () => {
    const { desk, scope } = await openAsAdmin(designAnswer({ ok: false, reason: 'approved_reopenable' }, 'approved'));

    expect(desk.canEdit.value).toBe(false);
    expect(desk.readOnlyReason.value).toMatch(/^This design is approved: its inputs are frozen\. Start a new revision to change it;/);
    scope.stop();
  });

  it('when the server says the design is editable, then there is no reason and an input change is taken', async () => {
    const { desk, scope } = await openAsAdmin(designAnswer({ ok: true, reason: null }));
    desk.set('belt.widthMm', 9);

    expect(desk.canEdit.value).toBe(true);
    expect(desk.readOnlyReason.value).toBeNull();
    expect(desk.get('belt.widthMm')).toBe(9);
    scope.stop();
  });
});
