import { describe, expect, it } from 'vitest';
import { retryMessage } from '../../../server/middleware/rateLimit';
import { escapeHtml, inviteMail, resetPasswordMail } from '../../../server/services/mailTemplates';
import { idParamsSchema } from '../../../server/schemas/common.schema';

describe('retryMessage', () => {
  const now = new Date('2026-01-01T10:00:00Z');
  it.each([
    [new Date('2026-01-01T10:15:00Z'), 'Try again in 15 minutes.'],
    [new Date('2026-01-01T10:14:01Z'), 'Try again in 15 minutes.'],
    [new Date('2026-01-01T10:00:30Z'), 'Try again in 1 minute.'],
    [undefined, 'Try again in 1 minute.'],
  ])('when the window resets at %s, then the message says "%s"', (reset, tail) => {
    expect(retryMessage(reset, now)).toBe(`Too many sign-in attempts. ${tail}`);
  });
});

describe('mail templates', () => {
  it('when a name contains HTML, then the html part escapes it and the text part keeps it', () => {
    const mail = resetPasswordMail({ name: '<img src=x onerror=alert(1)>', link: 'http://127.0.0.1:5180/reset?token=abc&x="y"' });
    expect(mail.html).not.toContain('<img');
    expect(mail.html).toContain('&lt;img src=x onerror=alert(1)&gt;');
    expect(mail.html).toContain('href="http://127.0.0.1:5180/reset?token=abc&amp;x=&quot;y&quot;"');
    expect(mail.text).toContain('Hello <img src=x onerror=alert(1)>,');
  });

  it('when an invitation is written, then it names the inviter and carries the link in both parts', () => {
    const mail = inviteMail({ name: 'Ivy', inviterName: 'Oriel', link: 'http://h/reset?token=t&invite=1' });
    expect(mail.subject).toBe('You are invited to Gantrywright');
    expect(mail.text).toContain('Oriel has invited you');
    expect(mail.text).toContain('http://h/reset?token=t&invite=1');
    expect(mail.html).toContain('http://h/reset?token=t&amp;invite=1');
  });

  it('when escaping, then all five HTML-special characters are replaced', () => {
    expect(escapeHtml(`&<>"'`)).toBe('&amp;&lt;&gt;&quot;&#39;');
  });
});

describe('idParamsSchema', () => {
  it.each(['1', '42', '2147483647'])('when :id is %s, then it parses to a number', (id) => {
    expect(idParamsSchema.parse({ id })).toEqual({ id: Number(id) });
  });
  it.each(['0', '-1', '1.0', '1e2', ' 1', '0x1', '2147483648', ''])('when :id is "%s", then it is rejected', (id) => {
    expect(idParamsSchema.safeParse({ id }).success).toBe(false);
  });
});
