import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { effectScope, ref } from 'vue';
import { ApiError } from '@/api/http';
import type { RevisionComment, RevisionDetail, RevisionDiff } from '@/api/revisions';
import { useReview } from '@/views/review/useReview';

vi.mock('@/api/revisions', () => ({
  getRevision: vi.fn(),
  getRevisionDiff: vi.fn(),
  listComments: vi.fn(),
  addComment: vi.fn(),
  approveRevision: vi.fn(),
  returnRevision: vi.fn(),
  withdrawDesign: vi.fn(),
}));
vi.mock('@/utils/message', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/utils/message')>()),
  showError: vi.fn(),
  showSuccess: vi.fn(),
}));
const api = vi.mocked(await import('@/api/revisions'));
const message = vi.mocked(await import('@/utils/message'));

const REVISION = { id: 31, designId: 7, number: 2, status: 'in_review' } as RevisionDetail;
const DIFF: RevisionDiff = { revisionId: 31, number: 2, engineVersion: '2.0.0', previous: null, inputs: [], results: [] };

function comment(id: number, body: string, parentId: number | null = null): RevisionComment {
  return {
    id,
    revisionId: 31,
    parentId,
    author: { id: 4, name: 'Rui Reviewer', roles: ['reviewer'] },
    body,
    createdAt: '2026-03-02T08:00:00Z',
  };
}

async function start() {
  const scope = effectScope();
  const review = scope.run(() => useReview(ref(31)))!;
  await flushPromises();
  return { review, scope };
}

describe('useReview', () => {
  beforeEach(() => {
    vi.resetAllMocks();
    api.getRevision.mockResolvedValue(REVISION);
    api.getRevisionDiff.mockResolvedValue(DIFF);
    api.listComments.mockResolvedValue({ items: [comment(1, 'Why 24 V?')], total: 1, page: 1, pageSize: 100 });
  });

  it('when a reply is posted, then the API gets the trimmed body and parent, and the reply joins its thread', async () => {
    // Arrange
    api.addComment.mockResolvedValue(comment(2, 'For speed.', 1));
    const { review, scope } = await start();
    // Act
    const ok = await review.comment('  For speed.  ', 1);
    // Assert
    expect(ok).toBe(true);
    expect(api.addComment).toHaveBeenCalledWith(31, 'For speed.', 1);
    expect(review.threads.value).toHaveLength(1);
    expect(review.threads.value[0].replies.map((r) => r.comment.body)).toEqual(['For speed.']);
    expect(review.isPosting.value).toBe(false);
    scope.stop();
  });

  it('when posting fails, then the error is shown, false is returned and the discussion is unchanged', async () => {
    const failure = new ApiError(403, 'forbidden', 'You are not allowed to do that.');
    api.addComment.mockRejectedValue(failure);
    const { review, scope } = await start();
    const ok = await review.comment('Hello');
    expect(ok).toBe(false);
    expect(message.showError).toHaveBeenCalledWith(failure, 'The comment could not be posted.');
    expect(review.comments.value.map((c) => c.id)).toEqual([1]);
    scope.stop();
  });

  it('when a return is sent, then the API gets the trimmed reason and the revision is replaced by the answer', async () => {
    const returned = { ...REVISION, status: 'returned', returnReason: 'Too slack.' } as RevisionDetail;
    api.returnRevision.mockResolvedValue(returned);
    const { review, scope } = await start();
    expect(await review.sendBack('  Too slack. ')).toBe(true);
    expect(api.returnRevision).toHaveBeenCalledWith(31, 'Too slack.');
    expect(review.revision.value?.status).toBe('returned');
    scope.stop();
  });

  it('when a decision conflicts with another reviewer’s, then the revision is loaded again', async () => {
    api.approveRevision.mockRejectedValue(new ApiError(409, 'conflict', 'Already decided.'));
    const { review, scope } = await start();
    expect(api.getRevision).toHaveBeenCalledTimes(1);
    expect(await review.approve('ok')).toBe(false);
    await flushPromises();
    expect(api.getRevision).toHaveBeenCalledTimes(2);
    expect(review.publishedSheetId.value).toBeNull();
    scope.stop();
  });

  it('when the revision does not exist, then notFound is set and nothing else is asked', async () => {
    api.getRevision.mockRejectedValue(new ApiError(404, 'not_found', 'Not found.'));
    const { review, scope } = await start();
    expect(review.notFound.value).toBe(true);
    expect(review.isLoading.value).toBe(false);
    expect(api.listComments).not.toHaveBeenCalled();
    scope.stop();
  });
});
