/** Subject, plain text and HTML of one e-mail. */
export type MailContent = { subject: string; text: string; html: string };

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

function layout(title: string, paragraphs: string[], link: { href: string; label: string }): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 14px">${escapeHtml(p)}</p>`).join('');
  return (
    `<!doctype html><html><body style="font-family:Inter,Arial,sans-serif;color:#1d2a33;line-height:1.5">` +
    `<h2 style="margin:0 0 16px;color:#0f5257">${escapeHtml(title)}</h2>${body}` +
    `<p style="margin:20px 0"><a href="${escapeHtml(link.href)}" style="background:#0f5257;color:#fff;padding:10px 18px;border-radius:6px;text-decoration:none">${escapeHtml(link.label)}</a></p>` +
    `<p style="font-size:12px;color:#5b6b75">If the button does not work, open this address: ${escapeHtml(link.href)}</p>` +
    `<p style="font-size:12px;color:#5b6b75">Gantrywright</p></body></html>`
  );
}

/** The password-reset mail (link valid for one hour, usable once). */
export function resetPasswordMail(input: { name: string; link: string }): MailContent {
  const lines = [
    `Hello ${input.name},`,
    'someone (hopefully you) asked to reset the password of your Gantrywright account.',
    'The link below works once and expires in one hour. If you did not ask for this, ignore this mail: your password stays as it is.',
  ];
  return {
    subject: 'Reset your Gantrywright password',
    text: `${lines.join('\n\n')}\n\nSet a new password: ${input.link}\n\nGantrywright\n`,
    html: layout('Reset your password', lines, { href: input.link, label: 'Set a new password' }),
  };
}

/** The invitation mail with a set-password link (valid for seven days, usable once). */
export function inviteMail(input: { name: string; inviterName: string; link: string }): MailContent {
  const lines = [
    `Hello ${input.name},`,
    `${input.inviterName} has invited you to the team on Gantrywright.`,
    'Choose your password with the link below. It works once and expires in seven days.',
  ];
  return {
    subject: 'You are invited to Gantrywright',
    text: `${lines.join('\n\n')}\n\nChoose your password: ${input.link}\n\nGantrywright\n`,
    html: layout('Welcome to Gantrywright', lines, { href: input.link, label: 'Choose your password' }),
  };
}
