import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import nodemailer from 'nodemailer';
import MailComposer from 'nodemailer/lib/mail-composer';
import { afterEach, describe, expect, it } from 'vitest';
import {
  decodeEncodedWords,
  isAllowedHost,
  parseHeaderParams,
  parseMessage,
  startMailCatcher,
  type MailCatcher,
} from '../../../scripts/mailcatcher';

function compose(options: ConstructorParameters<typeof MailComposer>[0]): Promise<Buffer> {
  return new MailComposer(options).compile().build();
}

describe('parseMessage', () => {
  it('when nodemailer sends text + html (multipart/alternative), then both parts come back decoded', async () => {
    const raw = await compose({
      from: 'Gantrywright <noreply@example.test>',
      to: 'ada@example.test',
      subject: 'Plain subject',
      text: 'Line one\nLine two with = sign and ümlaut',
      html: '<p>Hello <b>Ada</b> — ✓</p>',
    });

    const message = parseMessage(raw, { to: ['ada@example.test'] });

    expect(message.from).toBe('Gantrywright <noreply@example.test>');
    expect(message.to).toEqual(['ada@example.test']);
    expect(message.subject).toBe('Plain subject');
    expect(message.text).toBe('Line one\nLine two with = sign and ümlaut');
    expect(message.html).toBe('<p>Hello <b>Ada</b> — ✓</p>');
    expect(message.attachments).toEqual([]);
  });

  it('when the subject and names are non-ASCII (RFC 2047 encoded words), then they are decoded', async () => {
    const raw = await compose({
      from: 'Zoë Ångström <z@example.test>',
      to: 'b@example.test',
      subject: 'Grüße — Spannweite ✓ '.repeat(4).trim(),
      text: 'x',
    });
    const message = parseMessage(raw);
    expect(message.subject).toBe('Grüße — Spannweite ✓ '.repeat(4).trim());
    expect(message.from).toBe('Zoë Ångström <z@example.test>');
    expect(message.to).toEqual(['b@example.test']);
  });

  it('when a long line is quoted-printable wrapped, then soft line breaks are removed', async () => {
    const long = `${'belt '.repeat(60)}end`;
    const message = parseMessage(await compose({ from: 'a@example.test', to: 'b@example.test', subject: 's', text: long }));
    expect(message.text).toBe(long);
  });

  it('when there is an attachment (multipart/mixed), then body parts are still found and the attachment is listed', async () => {
    const raw = await compose({
      from: 'a@example.test',
      to: 'b@example.test',
      subject: 's',
      text: 'see sheet',
      html: '<p>see sheet</p>',
      attachments: [{ filename: 'sheet.pdf', content: Buffer.alloc(3000, 7), contentType: 'application/pdf' }],
    });
    const message = parseMessage(raw);
    expect(message.text).toBe('see sheet');
    expect(message.html).toBe('<p>see sheet</p>');
    expect(message.attachments).toEqual([{ filename: 'sheet.pdf', contentType: 'application/pdf', size: 3000 }]);
  });

  it('when the envelope has recipients (Bcc), then they make up "to"', async () => {
    const raw = await compose({ from: 'a@example.test', to: 'b@example.test', subject: 's', text: 't' });
    expect(parseMessage(raw, { to: ['b@example.test', 'hidden@example.test'] }).to).toEqual(['b@example.test', 'hidden@example.test']);
  });
});

describe('decodeEncodedWords and parseHeaderParams', () => {
  it.each([
    ['=?UTF-8?B?R3LDvMOfZQ==?=', 'Grüße'],
    ['=?utf-8?q?Gr=C3=BC=C3=9Fe_Welt?=', 'Grüße Welt'],
    ['=?UTF-8?Q?a?= =?UTF-8?Q?b?=', 'ab'],
    ['=?ISO-8859-1?Q?Caf=E9?= ok', 'Café ok'],
    ['no encoding here', 'no encoding here'],
  ])('when the header is %s, then it decodes to %s', (input, expected) => {
    expect(decodeEncodedWords(input)).toBe(expected);
  });

  it('when a content type has quoted parameters, then value and parameters are split', () => {
    expect(parseHeaderParams('Multipart/Alternative; boundary="--_b;1"; charset=utf-8')).toEqual({
      value: 'multipart/alternative',
      params: { boundary: '--_b;1', charset: 'utf-8' },
    });
  });
});

describe('startMailCatcher', () => {
  let catcher: MailCatcher | undefined;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-catcher-'));
  afterEach(async () => {
    await catcher?.close();
    catcher = undefined;
  });

  it('when mail is sent over SMTP, then GET /messages lists it, DELETE clears it, and a restart keeps stored mail', async () => {
    catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0, dir, log: () => undefined });
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port: catcher.smtpPort, secure: false, ignoreTLS: true });
    await transport.sendMail({ from: 'noreply@example.test', to: 'one@example.test', subject: 'first', text: 'hello' });
    await transport.sendMail({ from: 'noreply@example.test', to: 'two@example.test', subject: 'second', text: 'hello' });

    const all = (await (await fetch(`http://127.0.0.1:${catcher.httpPort}/messages`)).json()) as Array<{ subject: string }>;
    const onlyTwo = (await (await fetch(`http://127.0.0.1:${catcher.httpPort}/messages?to=TWO@example.test`)).json()) as Array<{
      subject: string;
    }>;
    expect(all.map((m: { subject: string }) => m.subject)).toEqual(['first', 'second']);
    expect(onlyTwo.map((m: { subject: string }) => m.subject)).toEqual(['second']);

    await catcher.close();
    catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0, dir, log: () => undefined });
    expect(catcher.messages().map((m) => m.subject)).toEqual(['first', 'second']);

    const del = await fetch(`http://127.0.0.1:${catcher.httpPort}/messages`, { method: 'DELETE' });
    const after = await (await fetch(`http://127.0.0.1:${catcher.httpPort}/messages`)).json();
    expect(del.status).toBe(204);
    expect(after).toEqual([]);
  });

  it('when the SMTP port is taken, then starting fails with a message naming the port', async () => {
    catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0, dir, log: () => undefined });
    await expect(startMailCatcher({ smtpPort: catcher.smtpPort, httpPort: 0, dir, log: () => undefined })).rejects.toThrow(
      `SMTP port ${catcher.smtpPort} on 127.0.0.1 is already in use`,
    );
  });

  // fix: #12 — the list answered any Host header, so a page on a name resolving to 127.0.0.1 (DNS rebinding) could read every caught mail.
  it('when a request names another host, then 403 and no mail; the loopback names with the port still work', async () => {
    // Arrange
    catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0, dir, log: () => undefined });
    const get = (host: string) =>
      new Promise<{ status: number; body: string }>((resolve, reject) => {
        const req = http.get({ host: '127.0.0.1', port: catcher!.httpPort, path: '/messages', headers: { Host: host } }, (res) => {
          let body = '';
          res.on('data', (c: Buffer) => (body += c.toString()));
          res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
        });
        req.on('error', reject);
      });
    const port = catcher.httpPort;
    // Act
    const rebound = await get(`attacker.example:${port}`);
    const otherPort = await get(`127.0.0.1:${port + 1}`);
    const loopback = await get(`127.0.0.1:${port}`);
    const localhost = await get(`localhost:${port}`);
    // Assert
    expect(rebound.status).toBe(403);
    expect(JSON.parse(rebound.body).error.code).toBe('forbidden_host');
    expect(rebound.body).not.toContain('subject');
    expect(otherPort.status).toBe(403);
    expect(loopback.status).toBe(200);
    expect(localhost.status).toBe(200);
  });
});

describe('isAllowedHost', () => {
  it.each([
    ['127.0.0.1:2527', true],
    ['localhost:2527', true],
    ['LOCALHOST:2527', true],
    ['[::1]:2527', true],
    ['127.0.0.1', false],
    ['evil.example:2527', false],
    ['127.0.0.1.nip.example:2527', false],
    [undefined, false],
  ])('when Host is %s, then %s', (host, expected) => {
    expect(isAllowedHost(host, '127.0.0.1', 2527)).toBe(expected);
  });
});
