import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import type { RevisionComment } from '@/api/revisions';
import ReviewComments from '@/views/review/ReviewComments.vue';
import { buildThreads, type CommentNode } from '@/views/review/useReview';

vi.setConfig({ testTimeout: 60_000 });

function comment(id: number, body: string, parentId: number | null = null, name = 'Rui Reviewer', roles = ['reviewer']): RevisionComment {
  return { id, revisionId: 9, parentId, author: { id: id + 100, name, roles }, body, createdAt: `2026-03-0${Math.min(id, 9)}T08:00:00Z` };
}

type PostArgs = [string, number | null, (ok: boolean) => void];

function mountComments(threads: CommentNode[], { canComment = true, isPosting = false } = {}) {
  return mount(ReviewComments, { props: { threads, canComment, isPosting }, attachTo: document.body });
}

describe('buildThreads', () => {
  it('when comments answer each other, then replies nest under their parent, oldest first', () => {
    // Arrange
    const flat = [
      comment(1, 'Why 24 V?'),
      comment(2, 'Second thread'),
      comment(3, 'For speed.', 1),
      comment(4, 'Thanks.', 3),
      comment(5, 'Agreed.', 1),
    ];
    // Act
    const threads = buildThreads(flat);
    // Assert
    expect(threads.map((t) => t.comment.id)).toEqual([1, 2]);
    expect(threads[0].replies.map((r) => r.comment.id)).toEqual([3, 5]);
    expect(threads[0].replies[0].replies.map((r) => r.comment.id)).toEqual([4]);
    expect(threads[1].replies).toEqual([]);
  });

  it('when a reply points at a missing parent, then it becomes a thread of its own instead of disappearing', () => {
    const threads = buildThreads([comment(1, 'Root'), comment(7, 'Orphan', 42)]);
    expect(threads.map((t) => t.comment.id)).toEqual([1, 7]);
  });
});

describe('ReviewComments', () => {
  it('when there are no comments, then says so', () => {
    const wrapper = mountComments([]);
    expect(wrapper.get('[data-test="comments-empty"]').text()).toBe('No comments yet.');
    wrapper.unmount();
  });

  it('when a comment is typed and sent, then post is emitted with the trimmed text and no parent, and the box clears once stored', async () => {
    // Arrange
    const wrapper = mountComments([]);
    await wrapper.get('textarea[data-test="comment-input"]').setValue('  Is the idler spacing checked?  ');
    // Act
    await wrapper.get('form').trigger('submit');
    // Assert
    const posts = wrapper.emitted('post') as PostArgs[];
    expect(posts).toHaveLength(1);
    expect(posts[0][0]).toBe('Is the idler spacing checked?');
    expect(posts[0][1]).toBeNull();
    const textarea = wrapper.get<HTMLTextAreaElement>('textarea[data-test="comment-input"]');
    expect(textarea.element.value).toBe('  Is the idler spacing checked?  ');
    posts[0][2](true);
    await flushPromises();
    expect(textarea.element.value).toBe('');
    wrapper.unmount();
  });

  it('when the server refuses a comment, then the draft is kept for another try', async () => {
    const wrapper = mountComments([]);
    await wrapper.get('textarea[data-test="comment-input"]').setValue('Keep me');
    await wrapper.get('form').trigger('submit');
    (wrapper.emitted('post') as PostArgs[])[0][2](false);
    await flushPromises();
    expect(wrapper.get<HTMLTextAreaElement>('textarea[data-test="comment-input"]').element.value).toBe('Keep me');
    wrapper.unmount();
  });

  it('when the comment is blank or a post is in flight, then nothing is emitted', async () => {
    const blank = mountComments([]);
    await blank.get('textarea[data-test="comment-input"]').setValue('   ');
    await blank.get('form').trigger('submit');
    expect(blank.emitted('post')).toBeUndefined();
    expect(blank.get('[data-test="comment-submit"]').attributes('disabled')).toBeDefined();

    const busy = mountComments([], { isPosting: true });
    await busy.get('textarea[data-test="comment-input"]').setValue('Hello');
    await busy.get('form').trigger('submit');
    expect(busy.emitted('post')).toBeUndefined();
    blank.unmount();
    busy.unmount();
  });

  it('when replying to a thread, then post carries that comment as parent and the reply form closes once stored', async () => {
    // Arrange
    const threads = buildThreads([comment(1, 'Why 24 V?'), comment(2, 'Other thread')]);
    const wrapper = mountComments(threads);
    expect(wrapper.find('[data-test="reply-body"]').exists()).toBe(false);
    // Act
    await wrapper.get('[data-test="comment-reply-1"]').trigger('click');
    await wrapper.get('textarea[data-test="reply-body"]').setValue(' For higher speed. ');
    await wrapper.get('.talk__form--reply').trigger('submit');
    // Assert
    const posts = wrapper.emitted('post') as PostArgs[];
    expect(posts[0][0]).toBe('For higher speed.');
    expect(posts[0][1]).toBe(1);
    posts[0][2](true);
    await flushPromises();
    expect(wrapper.find('[data-test="reply-body"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when threads have replies and replies to replies, then each shows inside its thread', () => {
    // Arrange
    const threads = buildThreads([
      comment(1, 'Why 24 V?'),
      comment(2, 'For speed.', 1, 'Dana Designer', ['designer']),
      comment(3, 'Thanks, fine.', 2),
    ]);
    // Act
    const wrapper = mountComments(threads);
    // Assert
    const root = wrapper.get('[data-test="comment-1"]').element.closest('.talk__thread')!;
    expect(root.querySelector('.talk__replies [data-test="comment-2"]')).not.toBeNull();
    expect(root.querySelector('[data-test="comment-2"] .talk__replies [data-test="comment-3"]')).not.toBeNull();
    expect(wrapper.get('[data-test="comment-2"]').text()).toContain('Dana Designer');
    expect(wrapper.findAll('[data-test="comment-body"]').map((b) => b.text())).toEqual(['Why 24 V?', 'For speed.', 'Thanks, fine.']);
    // replies are answered in the thread, not individually
    expect(wrapper.find('[data-test="comment-reply-2"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when the user may not comment, then neither the comment box nor reply buttons show', () => {
    const wrapper = mountComments(buildThreads([comment(1, 'Why 24 V?')]), { canComment: false });
    expect(wrapper.find('[data-test="comment-input"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="comment-reply-1"]').exists()).toBe(false);
    expect(wrapper.text()).toContain('take part in the discussion');
    wrapper.unmount();
  });
});
