// Outgoing mail through SMTP (nodemailer). In development and tests the SMTP server is the
// local catcher started by the scripts; in production, SMTP_URL names the team's relay.
import nodemailer, { type Transporter } from 'nodemailer';
import { config } from './config';

let transport: Transporter | null = null;

function getTransport(): Transporter {
  transport ??= nodemailer.createTransport(config.smtpUrl);
  return transport;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  /** An HTML alternative to the plain text, when the message has one. */
  html?: string;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await getTransport().sendMail({ from: config.mailFrom, ...mail });
}
