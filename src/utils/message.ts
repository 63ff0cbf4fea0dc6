import type { MessageParams } from 'element-plus';
import { isApiError } from '@/api/http';

/**
 * The one way the app tells people about outcomes: wraps Element Plus' message and confirm boxes.
 */

/**
 * Shows a toast. Element Plus' message component loads on the first toast rather than with every page: most page
 * visits never show one, and the first one appears a few milliseconds later at most.
 */
function toast(options: MessageParams): void {
  void import('element-plus/es/components/message/index.mjs').then(({ ElMessage }) => ElMessage(options));
}

/**
 * Turns anything thrown into a sentence fit for people (an API validation error lists its fields).
 * @param err - an ApiError, an Error or anything else
 * @param fallback - used when nothing better is known
 */
export function errorMessage(err: unknown, fallback = 'Something went wrong. Try again.'): string {
  if (isApiError(err)) return err.describe();
  if (err instanceof Error && err.message) return err.message;
  return fallback;
}

/**
 * Shows an error toast. A 401 from a non-auth call is skipped: the HTTP client already sends the
 * user to the sign-in page, and a second message would only repeat it.
 * @param err - what was thrown
 * @param fallback - message when the error carries none
 */
export function showError(err: unknown, fallback?: string): void {
  if (isApiError(err) && err.status === 401 && err.code !== 'invalid_credentials') return;
  toast({ type: 'error', message: errorMessage(err, fallback), showClose: true, duration: 6000 });
}

/** Shows a short success toast. */
export function showSuccess(message: string): void {
  toast({ type: 'success', message, duration: 3000 });
}

/** Shows a short neutral toast. */
export function showInfo(message: string): void {
  toast({ type: 'info', message, duration: 3000 });
}

/** Options of {@link confirmAction}. */
export interface ConfirmOptions {
  title: string;
  message: string;
  confirmText: string;
  /** Red confirm button for destructive actions. */
  isDanger?: boolean;
}

/**
 * Asks the user to confirm an action.
 * @returns true when confirmed, false when cancelled or closed
 */
export async function confirmAction(options: ConfirmOptions): Promise<boolean> {
  // Loaded on first use: the confirm box is ~20 kB that no page needs before someone asks to delete something.
  const { ElMessageBox } = await import('element-plus/es/components/message-box/index.mjs');
  try {
    await ElMessageBox.confirm(options.message, options.title, {
      confirmButtonText: options.confirmText,
      cancelButtonText: 'Cancel',
      type: options.isDanger ? 'warning' : 'info',
      confirmButtonClass: options.isDanger ? 'el-button--danger' : undefined,
      autofocus: false,
    });
    return true;
  } catch {
    return false;
  }
}
