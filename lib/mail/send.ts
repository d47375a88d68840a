import nodemailer, { type Transporter } from 'nodemailer';
import SMTPTransport from 'nodemailer/lib/smtp-transport';

const FROM = process.env.MAIL_FROM ?? 'Bandcone <no-reply@bandcone.test>';
let transporter: Transporter | undefined;

// SMTP_URL points at the local catcher by default; a real relay's URL needs no code change.
export function smtpUrl(): string {
  return process.env.SMTP_URL ?? 'smtp://127.0.0.1:2525';
}

// Bounded waits: a relay that hangs must fail the attempt (and be retried) well before the
// queue's job lease (120 s) runs out, or the same message could be handed out twice.
function transport(): Transporter {
  transporter ??= nodemailer.createTransport(
    new SMTPTransport({ url: smtpUrl(), connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 }),
  );
  return transporter;
}

export type OutgoingMail = { to: string | string[]; subject: string; text: string; html?: string };

/** One SMTP delivery, now. Only the mail queue's worker calls this (lib/mail/queue.ts). */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: FROM, ...mail });
}

/** A 5xx reply (mailbox unknown, message refused) will not change by trying again. */
export function isPermanentSmtpFailure(err: unknown): boolean {
  const code = (err as { responseCode?: number }).responseCode;
  return typeof code === 'number' && code >= 500 && code < 600;
}
