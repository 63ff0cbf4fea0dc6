import os from 'node:os';
import nodemailer, { type Transporter } from 'nodemailer';
import { getConfig } from '../config';
import { logger } from '../logger';

/** A message to send: both a plain-text and an HTML part. */
export type MailInput = {
  to: string | string[];
  subject: string;
  text: string;
  html: string;
  /** A fixed Message-ID (`<…@host>`), e.g. the queue's, so every attempt of one mail carries the same one. */
  messageId?: string;
};

let transporter: Transporter | undefined;

/** This process, as `pid@host`. */
const SENDER = `${process.pid}@${os.hostname()}`;

function getTransporter(): Transporter {
  if (!transporter) {
    const { smtp } = getConfig();
    transporter = nodemailer.createTransport({
      // A few kept-open connections: the queue worker sends in bursts, and a new SMTP session per mail costs more
      // than the mail itself.
      pool: true,
      maxConnections: 3,
      host: smtp.host,
      port: smtp.port,
      secure: smtp.secure,
      // The local catcher speaks plain SMTP; a real relay with credentials negotiates TLS itself.
      ignoreTLS: !smtp.user,
      auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? '' } : undefined,
      connectionTimeout: 5000,
      greetingTimeout: 5000,
      socketTimeout: 10_000,
    });
  }
  return transporter;
}

const RETRY_DELAYS_MS = [200, 800];
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Sends a mail through SMTP, retrying twice on failure. Never throws: a mail that cannot be delivered
 * is logged and reported as `false`, so it never undoes the state change that triggered it.
 * @returns whether the SMTP server accepted the message.
 */
export async function sendMail(input: MailInput): Promise<boolean> {
  const { mailFrom } = getConfig();
  for (let attempt = 0; ; attempt += 1) {
    try {
      const info = await getTransporter().sendMail({
        from: mailFrom,
        to: input.to,
        subject: input.subject,
        text: input.text,
        html: input.html,
        ...(input.messageId ? { messageId: input.messageId } : {}),
        // Which process sent it: when a mail leaves twice (its sender died after the SMTP server took it but before the
        // queue recorded that), this says which process to look at.
        headers: { 'X-Gantrywright-Sender': SENDER },
      });
      logger.info({ to: input.to, subject: input.subject, messageId: info.messageId }, 'mail sent');
      return true;
    } catch (err) {
      if (attempt >= RETRY_DELAYS_MS.length) {
        logger.error({ err, to: input.to, subject: input.subject }, 'mail could not be sent');
        return false;
      }
      await sleep(RETRY_DELAYS_MS[attempt]);
    }
  }
}

/** Closes pooled SMTP connections (shutdown). */
export function closeMail(): void {
  transporter?.close();
  transporter = undefined;
}
