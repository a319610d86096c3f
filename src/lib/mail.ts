import nodemailer, { type Transporter } from 'nodemailer';
import { loadConfig } from './config';
import { lookup, shared } from './runtime';

export type OutgoingMail = {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
};

/** The runtime key under which the Node entry publishes the built-in sink's SMTP URL. */
export const MAIL_SINK_URL = 'mailSinkUrl';

function smtpUrl(): string {
  const url = loadConfig().smtpUrl ?? lookup<string>(MAIL_SINK_URL);
  if (!url) throw new Error('No mail transport: set SMTP_URL or start the built-in mail sink');
  return url;
}

function transport(): Transporter {
  const url = smtpUrl();
  return shared(`mail-transport:${url}`, () => nodemailer.createTransport(url));
}

/** Send one message over SMTP; resolves with the Message-ID once the server accepted it. */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  const info = await transport().sendMail({ from: loadConfig().mailFrom, ...mail });
  return info.messageId;
}
