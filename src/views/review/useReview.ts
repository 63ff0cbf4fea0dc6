import { computed, ref, shallowRef, watch, type Ref } from 'vue';
import {
  addComment,
  approveRevision,
  getRevision,
  getRevisionDiff,
  listComments,
  returnRevision,
  withdrawDesign,
  type RevisionComment,
  type RevisionDetail,
  type RevisionDiff,
} from '@/api/revisions';
import { isApiError } from '@/api/http';
import { errorMessage, showError, showSuccess } from '@/utils/message';

/** A comment with its replies, for the threaded view. */
export interface CommentNode {
  comment: RevisionComment;
  replies: CommentNode[];
}

/**
 * Nests a flat, oldest-first list of comments under their parents. A reply whose parent is missing becomes a
 * thread of its own, so nothing is ever hidden.
 * @param comments - as the API lists them
 * @returns the threads, oldest first, each with its replies oldest first
 */
export function buildThreads(comments: RevisionComment[]): CommentNode[] {
  const nodes = new Map<number, CommentNode>(comments.map((c) => [c.id, { comment: c, replies: [] }]));
  const roots: CommentNode[] = [];
  for (const c of comments) {
    const node = nodes.get(c.id)!;
    const parent = c.parentId === null ? undefined : nodes.get(c.parentId);
    if (parent && parent !== node) parent.replies.push(node);
    else roots.push(node);
  }
  return roots;
}

/**
 * State and actions of the review page for one revision: the frozen revision, its diff against the previous
 * revision, the discussion, and the decision (approve with a comment, return with a reason) or withdrawal.
 * The server enforces every rule; `permissions` from the server decide which buttons show.
 * @param id - the revision id from the route
 */
export function useReview(id: Ref<number>) {
  const revision = shallowRef<RevisionDetail | null>(null);
  const diff = shallowRef<RevisionDiff | null>(null);
  const comments = shallowRef<RevisionComment[]>([]);
  const isLoading = ref(true);
  const loadError = ref<string | null>(null);
  const notFound = ref(false);
  const diffError = ref<string | null>(null);
  const isDeciding = ref(false);
  const isPosting = ref(false);
  /** Set after an approval: the published sheet. */
  const publishedSheetId = ref<number | null>(null);

  const threads = computed(() => buildThreads(comments.value));

  async function loadComments(): Promise<void> {
    comments.value = (await listComments(id.value)).items;
  }

  /** Loads the revision, its diff and its discussion. */
  async function load(): Promise<void> {
    isLoading.value = true;
    loadError.value = null;
    notFound.value = false;
    try {
      revision.value = await getRevision(id.value);
    } catch (err) {
      revision.value = null;
      if (isApiError(err) && (err.status === 404 || err.status === 400)) notFound.value = true;
      loadError.value = errorMessage(err, 'The revision could not be loaded.');
      isLoading.value = false;
      return;
    }
    const [diffResult, commentResult] = await Promise.allSettled([getRevisionDiff(id.value), loadComments()]);
    diff.value = diffResult.status === 'fulfilled' ? diffResult.value : null;
    diffError.value = diffResult.status === 'rejected' ? errorMessage(diffResult.reason, 'The changes could not be loaded.') : null;
    if (commentResult.status === 'rejected') showError(commentResult.reason, 'The discussion could not be loaded.');
    isLoading.value = false;
  }

  /**
   * Approves the revision with an optional comment (and the justification a failed check requires); the server
   * renders and stores the design sheet.
   * @returns whether it worked
   */
  async function approve(comment: string, justification = ''): Promise<boolean> {
    isDeciding.value = true;
    try {
      const answer = await approveRevision(id.value, comment.trim(), justification.trim());
      revision.value = answer.revision;
      publishedSheetId.value = answer.sheet.id;
      showSuccess(`Approved. The design sheet of revision ${answer.revision.number} is published.`);
      return true;
    } catch (err) {
      showError(err, 'The revision could not be approved.');
      if (isApiError(err) && err.status === 409) await load();
      return false;
    } finally {
      isDeciding.value = false;
    }
  }

  /**
   * Returns the revision to its designer with a reason.
   * @returns whether it worked
   */
  async function sendBack(reason: string): Promise<boolean> {
    isDeciding.value = true;
    try {
      revision.value = await returnRevision(id.value, reason.trim());
      showSuccess('Returned to the designer with your reason.');
      return true;
    } catch (err) {
      showError(err, 'The revision could not be returned.');
      if (isApiError(err) && err.status === 409) await load();
      return false;
    } finally {
      isDeciding.value = false;
    }
  }

  /** Withdraws the revision (its designer or an admin). */
  async function withdraw(): Promise<boolean> {
    if (!revision.value) return false;
    isDeciding.value = true;
    try {
      revision.value = await withdrawDesign(revision.value.designId);
      showSuccess('Withdrawn. The design is a draft again.');
      return true;
    } catch (err) {
      showError(err, 'The revision could not be withdrawn.');
      return false;
    } finally {
      isDeciding.value = false;
    }
  }

  /**
   * Posts a comment, or a reply to `parentId`.
   * @returns whether it was stored
   */
  async function comment(body: string, parentId: number | null = null): Promise<boolean> {
    isPosting.value = true;
    try {
      const created = await addComment(id.value, body.trim(), parentId);
      comments.value = [...comments.value, created];
      return true;
    } catch (err) {
      showError(err, 'The comment could not be posted.');
      return false;
    } finally {
      isPosting.value = false;
    }
  }

  watch(id, () => void load(), { immediate: true });

  return {
    revision,
    diff,
    comments,
    threads,
    isLoading,
    loadError,
    notFound,
    diffError,
    isDeciding,
    isPosting,
    publishedSheetId,
    load,
    approve,
    sendBack,
    withdraw,
    comment,
  };
}
