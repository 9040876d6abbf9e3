import 'server-only';
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/lib/env';

/**
 * Outgoing mail through any SMTP server (SMTP_HOST, SMTP_PORT, SMTP_SECURE, SMTP_USER,
 * SMTP_PASSWORD). In development and tests these point at the local mail sink. Only the mail
 * queue's sender calls this (lib/mail/queue.ts): the app queues messages, it never sends them
 * while answering a request.
 */
let transporter: Transporter | undefined;

function transport(): Transporter {
  if (transporter) return transporter;
  const e = env();
  transporter = nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD ?? '' } : undefined,
    // The local sink has no certificate; a real provider on port 587 upgrades with STARTTLS.
    ignoreTLS: e.SMTP_HOST === '127.0.0.1' || e.SMTP_HOST === 'localhost',
    // Bounded, so that one attempt ends well within the queue job's expiry (lib/mail/queue.ts).
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return transporter;
}

export interface Mail {
  to: string;
  subject: string;
  text: string;
  html: string;
  /** Extra header lines, e.g. List-Unsubscribe (RFC 2369) and List-Unsubscribe-Post (RFC 8058). */
  headers?: Record<string, string>;
}

/**
 * Sends one message. `messageId` is the same on every attempt of one queued message, so that a
 * receiving server or mail program that sees it twice can tell it is one message.
 */
export async function sendMail(mail: Mail & { messageId?: string }): Promise<void> {
  await transport().sendMail({ from: env().MAIL_FROM, ...mail });
}
