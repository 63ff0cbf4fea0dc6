import { getConfig } from '../config';
import { User } from '../models';
import { resetPasswordMail, type MailContent } from './mailTemplates';
import { createPasswordToken } from './passwordToken.service';

/**
 * The password-reset mail goes through the mail queue like every notice, but its content is built only when it is
 * sent: the forgot route then does the same work for every address (one queued row), so neither its answer nor its
 * timing tells whether an account exists (issue 12, item 5), and the raw one-time token never sits in the queue.
 */

/** Queue kind of a password-reset request. */
export const RESET_MAIL_KIND = 'auth.reset';

/** The subject stored with the queued row (the body is built at sending time). */
export const RESET_MAIL_SUBJECT = 'Reset your Gantrywright password';

/**
 * Builds the reset mail for an address at sending time: creates a one-hour token when the address belongs to an
 * active account. @returns the mail, or null when there is nobody to send it to (the queued row is then discarded)
 */
export async function buildResetMail(email: string): Promise<MailContent | null> {
  const user = await User.findOne({ where: { email } });
  if (!user || user.disabled) return null;
  const token = await createPasswordToken(user.id, 'reset');
  const link = `${getConfig().appUrl}/reset?token=${encodeURIComponent(token)}`;
  return resetPasswordMail({ name: user.name, link });
}
