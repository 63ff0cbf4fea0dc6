/**
 * The local mail catcher for development and tests: an SMTP server (no auth, no TLS) on SMTP_HOST:SMTP_PORT
 * that keeps every message it receives, and a loopback HTTP endpoint on MAILCATCHER_HTTP_PORT:
 *   GET /messages[?to=addr]  -> JSON list, oldest first: [{id, from, to[], subject, date, text, html, attachments}]
 *   DELETE /messages         -> forget them all (204)
 * Messages are appended to DATA_DIR/mail/messages.jsonl, so a restart keeps them.
 *
 *   tsx scripts/mailcatcher.ts      run standalone until Ctrl-C
 */
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { SMTPServer } from 'smtp-server';

/** One caught e-mail. `to` lists the envelope recipients (so Bcc shows too). */
export type CaughtMessage = {
  id: string;
  from: string;
  to: string[];
  subject: string;
  date: string;
  messageId: string | null;
  /** The app process that sent it (X-Gantrywright-Sender: pid@host), when given. */
  sentBy: string | null;
  text: string;
  html: string;
  attachments: Array<{ filename: string | null; contentType: string; size: number }>;
};

// ---------------------------------------------------------------------------------------------
// A small MIME reader: enough for what nodemailer sends (headers with encoded words, multipart
// alternative/mixed/related, quoted-printable and base64 bodies, any charset TextDecoder knows).

type Part = { headers: Map<string, string>; body: string };

/** Splits a raw message (as a binary "latin1" string) into unfolded headers and body. */
function splitPart(raw: string): Part {
  const match = /\r?\n\r?\n/.exec(raw);
  const headerText = match ? raw.slice(0, match.index) : raw;
  const body = match ? raw.slice(match.index + match[0].length) : '';
  const headers = new Map<string, string>();
  const unfolded = headerText.replace(/\r?\n[ \t]+/g, ' ');
  for (const line of unfolded.split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(colon + 1).trim());
  }
  return { headers, body };
}

/** `text/plain; charset="utf-8"` -> { value: 'text/plain', params: { charset: 'utf-8' } } */
export function parseHeaderParams(header: string | undefined): { value: string; params: Record<string, string> } {
  if (!header) return { value: '', params: {} };
  // Split on semicolons outside double quotes (a boundary may contain ';').
  const [value, ...rest] = header.match(/(?:[^;"]|"(?:[^"\\]|\\.)*")+/g) ?? [''];
  const params: Record<string, string> = {};
  for (const piece of rest) {
    const eq = piece.indexOf('=');
    if (eq <= 0) continue;
    const key = piece.slice(0, eq).trim().toLowerCase();
    let val = piece.slice(eq + 1).trim();
    if (val.startsWith('"') && val.endsWith('"')) val = val.slice(1, -1).replace(/\\(.)/g, '$1');
    params[key] = val;
  }
  return { value: value.trim().toLowerCase(), params };
}

function bytesToString(bytes: Buffer, charset = 'utf-8'): string {
  try {
    return new TextDecoder(charset.toLowerCase() === 'us-ascii' ? 'utf-8' : charset).decode(bytes);
  } catch {
    return bytes.toString('utf8');
  }
}

/** Quoted-printable to bytes (RFC 2045 6.7); `forHeader` also maps _ to space (RFC 2047 Q encoding). */
function decodeQuotedPrintable(input: string, forHeader = false): Buffer {
  const text = (forHeader ? input.replace(/_/g, ' ') : input).replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < text.length; i += 1) {
    const ch = text[i];
    if (ch === '=' && /^[0-9A-Fa-f]{2}$/.test(text.slice(i + 1, i + 3))) {
      bytes.push(parseInt(text.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(text.charCodeAt(i) & 0xff);
    }
  }
  return Buffer.from(bytes);
}

/** Decodes RFC 2047 encoded words (`=?utf-8?Q?...?=`, `=?utf-8?B?...?=`) in a header value. */
export function decodeEncodedWords(value: string): string {
  // Raw 8-bit header bytes (SMTPUTF8) arrive as latin1 characters: reread them as UTF-8 first.
  const raw = /[\u0080-\u00ff]/.test(value) ? bytesToString(Buffer.from(value, 'latin1')) : value;
  // Whitespace between two adjacent encoded words is not part of the text.
  const joined = raw.replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?[^?]+\?[BbQq]\?[^?]*\?=)/g, '$1');
  return joined.replace(/=\?([^?*]+)(?:\*[^?]+)?\?([BbQq])\?([^?]*)\?=/g, (_m, charset: string, enc: string, data: string) => {
    const bytes = enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64') : decodeQuotedPrintable(data, true);
    return bytesToString(bytes, charset);
  });
}

function decodeBody(part: Part): Buffer {
  const encoding = (part.headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  if (encoding === 'base64') return Buffer.from(part.body.replace(/[^A-Za-z0-9+/=]/g, ''), 'base64');
  if (encoding === 'quoted-printable') return decodeQuotedPrintable(part.body);
  return Buffer.from(part.body, 'latin1');
}

function splitMultipart(body: string, boundary: string): string[] {
  const escaped = boundary.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const delimiter = new RegExp(`(?:^|\\r?\\n)--${escaped}(--)?[ \\t]*(?=\\r?\\n|$)`, 'g');
  const parts: string[] = [];
  let last = -1;
  let m: RegExpExecArray | null;
  while ((m = delimiter.exec(body))) {
    if (last >= 0) parts.push(body.slice(last, m.index));
    if (m[1]) return parts;
    last = m.index + m[0].length;
    // Skip the line break after the delimiter line.
    const nl = /^\r?\n/.exec(body.slice(last));
    if (nl) last += nl[0].length;
  }
  if (last >= 0) parts.push(body.slice(last));
  return parts;
}

function walk(part: Part, out: Pick<CaughtMessage, 'text' | 'html' | 'attachments'>): void {
  const type = parseHeaderParams(part.headers.get('content-type') ?? 'text/plain');
  const disposition = parseHeaderParams(part.headers.get('content-disposition'));
  if (type.value.startsWith('multipart/') && type.params.boundary) {
    for (const child of splitMultipart(part.body, type.params.boundary)) walk(splitPart(child), out);
    return;
  }
  const bytes = decodeBody(part);
  const isAttachment = disposition.value === 'attachment' || (!type.value.startsWith('text/') && type.value !== '');
  // SMTP lines end in CRLF; the stored text uses plain LF.
  if (!isAttachment && type.value === 'text/plain' && !out.text)
    out.text = bytesToString(bytes, type.params.charset).replace(/\r\n/g, '\n');
  else if (!isAttachment && type.value === 'text/html' && !out.html)
    out.html = bytesToString(bytes, type.params.charset).replace(/\r\n/g, '\n');
  else {
    const filename = disposition.params.filename ?? type.params.name ?? null;
    out.attachments.push({
      filename: filename ? decodeEncodedWords(filename) : null,
      contentType: type.value || 'application/octet-stream',
      size: bytes.length,
    });
  }
}

/**
 * Parses a raw RFC 5322 message into the fields the Outbox shows.
 * @param raw - the message bytes as received over SMTP
 * @param envelope - SMTP envelope; its recipients become `to`
 */
export function parseMessage(raw: Buffer | string, envelope?: { from?: string; to?: string[] }, received = new Date()): CaughtMessage {
  const part = splitPart(typeof raw === 'string' ? Buffer.from(raw, 'utf8').toString('latin1') : raw.toString('latin1'));
  // The line break that ends the DATA of a single-part message is not part of its text.
  if (!parseHeaderParams(part.headers.get('content-type')).value.startsWith('multipart/')) part.body = part.body.replace(/\r?\n$/, '');
  const out: Pick<CaughtMessage, 'text' | 'html' | 'attachments'> = { text: '', html: '', attachments: [] };
  walk(part, out);
  const headerTo = decodeEncodedWords(part.headers.get('to') ?? '');
  const addressesInTo = [...headerTo.matchAll(/[^\s<>,;"]+@[^\s<>,;"]+/g)].map((m) => m[0]);
  return {
    id: randomUUID(),
    from: decodeEncodedWords(part.headers.get('from') ?? envelope?.from ?? ''),
    to: envelope?.to?.length ? envelope.to : addressesInTo,
    subject: decodeEncodedWords(part.headers.get('subject') ?? ''),
    date: received.toISOString(),
    messageId: part.headers.get('message-id') ?? null,
    sentBy: part.headers.get('x-gantrywright-sender') ?? null,
    ...out,
  };
}

// ---------------------------------------------------------------------------------------------

/** A running catcher. */
export type MailCatcher = { smtpPort: number; httpPort: number; messages: () => CaughtMessage[]; close: () => Promise<void> };

const MAX_KEPT = 2000;

function loadMessages(file: string): CaughtMessage[] {
  if (!fs.existsSync(file)) return [];
  const messages: CaughtMessage[] = [];
  for (const line of fs.readFileSync(file, 'utf8').split('\n')) {
    if (!line.trim()) continue;
    try {
      messages.push(JSON.parse(line) as CaughtMessage);
    } catch {
      // a torn last line after a crash: skip it
    }
  }
  if (messages.length > MAX_KEPT) {
    const kept = messages.slice(-MAX_KEPT / 2);
    fs.writeFileSync(file, kept.map((m) => JSON.stringify(m)).join('\n') + '\n');
    return kept;
  }
  return messages;
}

function listen(
  server: { listen: (port: number, host: string, cb: () => void) => unknown; once: (e: string, cb: (err: Error) => void) => unknown },
  port: number,
  host: string,
  what: string,
): Promise<void> {
  return new Promise((resolve, reject) => {
    server.once('error', (err: Error) => {
      const code = (err as NodeJS.ErrnoException).code;
      reject(
        code === 'EADDRINUSE'
          ? new Error(`${what} port ${port} on ${host} is already in use. Stop the other program or choose another port in .env.`)
          : err,
      );
    });
    server.listen(port, host, () => resolve());
  });
}

/**
 * Whether a request's Host header names this catcher: the address it listens on, 127.0.0.1, localhost or [::1],
 * with its port. Anything else is refused (DNS rebinding: a web page on a name that resolves to 127.0.0.1 would
 * otherwise read every caught mail, reset links included; issue 12, item 10).
 */
export function isAllowedHost(hostHeader: string | undefined, listenHost: string, port: number): boolean {
  if (!hostHeader) return false;
  const names = new Set([listenHost, '127.0.0.1', 'localhost', '[::1]'].map((h) => (h.includes(':') && !h.startsWith('[') ? `[${h}]` : h)));
  return [...names].some((name) => hostHeader.toLowerCase() === `${name}:${port}`);
}

/**
 * Starts the SMTP catcher and its HTTP list. Messages persist in `dir`/messages.jsonl.
 */
export async function startMailCatcher(options: {
  host?: string;
  smtpPort: number;
  httpPort: number;
  dir: string;
  log?: (line: string) => void;
}): Promise<MailCatcher> {
  const host = options.host ?? '127.0.0.1';
  const log = options.log ?? ((line: string) => process.stdout.write(`${line}\n`));
  fs.mkdirSync(options.dir, { recursive: true });
  const file = path.join(options.dir, 'messages.jsonl');
  let messages = loadMessages(file);

  const smtp = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    hideSTARTTLS: true,
    logger: false,
    banner: 'Gantrywright local mail catcher',
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('error', callback);
      stream.on('end', () => {
        try {
          const message = parseMessage(Buffer.concat(chunks), {
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : undefined,
            to: session.envelope.rcptTo.map((r) => r.address),
          });
          messages.push(message);
          fs.appendFileSync(file, `${JSON.stringify(message)}\n`);
          callback();
        } catch (err) {
          callback(err as Error);
        }
      });
    },
  });

  const web = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', `http://${host}`);
    const send = (status: number, body?: unknown) => {
      res.writeHead(status, body === undefined ? {} : { 'Content-Type': 'application/json; charset=utf-8' });
      res.end(body === undefined ? undefined : JSON.stringify(body));
    };
    if (!isAllowedHost(req.headers.host, host, (web.address() as AddressInfo).port)) {
      send(403, {
        error: {
          code: 'forbidden_host',
          message: 'The mail catcher answers only requests addressed to the loopback address it listens on.',
        },
      });
      return;
    }
    if (url.pathname === '/messages' && req.method === 'GET') {
      const to = url.searchParams.get('to')?.toLowerCase();
      send(200, to ? messages.filter((m) => m.to.some((t) => t.toLowerCase() === to)) : messages);
    } else if (url.pathname === '/messages' && req.method === 'DELETE') {
      messages = [];
      fs.writeFileSync(file, '');
      send(204);
    } else if (url.pathname === '/health' && req.method === 'GET') {
      send(200, { status: 'ok', messages: messages.length });
    } else {
      send(404, { error: { code: 'not_found', message: 'Use GET or DELETE /messages.' } });
    }
  });

  // A sender that dies with a connection open (a pooled SMTP connection of a killed app process) resets it: that is
  // the sender's problem, not a reason for the catcher to stop.
  smtp.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code !== 'ECONNRESET' && err.code !== 'EPIPE') log(`Mail catcher: ${err.message}`);
  });
  await listen(smtp as unknown as Parameters<typeof listen>[0], options.smtpPort, host, 'SMTP');
  try {
    await listen(web, options.httpPort, host, 'Mail catcher HTTP');
  } catch (err) {
    await new Promise<void>((resolve) => smtp.close(() => resolve()));
    throw err;
  }
  // Port 0 means "any free port": report the ones actually bound.
  const smtpPort = (smtp.server.address() as AddressInfo).port;
  const httpPort = (web.address() as AddressInfo).port;
  log(`Mail catcher: SMTP on ${host}:${smtpPort}, list on http://${host}:${httpPort}/messages`);

  let closing: Promise<void> | undefined;
  return {
    smtpPort,
    httpPort,
    messages: () => messages.slice(),
    close: () => {
      closing ??= Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        new Promise<void>((resolve) => {
          web.close(() => resolve());
          web.closeAllConnections();
        }),
      ]).then(() => undefined);
      return closing;
    },
  };
}

async function cli(): Promise<void> {
  const { loadDotEnv } = await import('../server/config');
  const { resolveFromRoot } = await import('../server/paths');
  loadDotEnv();
  const catcher = await startMailCatcher({
    host: process.env.SMTP_HOST || '127.0.0.1',
    smtpPort: Number(process.env.SMTP_PORT || 2526),
    httpPort: Number(process.env.MAILCATCHER_HTTP_PORT || 2527),
    dir: path.join(resolveFromRoot(process.env.DATA_DIR || '.data'), 'mail'),
  });
  const stop = () => {
    void catcher.close().then(() => process.exit(0));
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  cli().catch((err: unknown) => {
    process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
    process.exit(1);
  });
}
