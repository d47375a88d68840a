import nodemailer, { type Transporter } from 'nodemailer';

const FROM = process.env.MAIL_FROM ?? 'Bandcone <no-reply@bandcone.test>';
let transporter: Transporter | undefined;

// SMTP_URL points at the local catcher by default; a real relay's URL needs no code change.
export function smtpUrl(): string {
  return process.env.SMTP_URL ?? 'smtp://127.0.0.1:2525';
}

function transport(): Transporter {
  transporter ??= nodemailer.createTransport(smtpUrl());
  return transporter;
}

export type OutgoingMail = { to: string | string[]; subject: string; text: string; html?: string };

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transport().sendMail({ from: FROM, ...mail });
}
