/**
 * The built-in SMTP sink: with no SMTP_URL set, every message Rungwise sends
 * goes over a real SMTP conversation to this loopback server, which stores it
 * in SQLite for the admin Outbox.
 */
import { simpleParser, type AddressObject } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { db, schema } from '../src/db/client';

const MAX_MESSAGE_BYTES = 40 * 1024 * 1024;

export type MailSink = { url: string; port: number; close(): Promise<void> };

export async function startMailSink(port = Number(process.env.MAIL_SINK_PORT ?? 0)): Promise<MailSink> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_MESSAGE_BYTES,
    banner: 'Rungwise mail sink',
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          return callback(Object.assign(new Error('Message too large for the mail sink'), { responseCode: 552 }));
        }
        storeMessage(Buffer.concat(chunks)).then(() => callback(), callback);
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const bound = (server.server.address() as AddressInfo).port;
  return {
    url: `smtp://127.0.0.1:${bound}`,
    port: bound,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

const addresses = (field: AddressObject | AddressObject[] | undefined): string[] =>
  (Array.isArray(field) ? field : field ? [field] : []).flatMap((group) =>
    group.value.map((entry) => entry.address ?? entry.name).filter((a): a is string => Boolean(a)),
  );

export async function storeMessage(raw: Buffer): Promise<void> {
  const parsed = await simpleParser(raw);
  db()
    .insert(schema.mailMessage)
    .values({
      id: crypto.randomUUID(),
      messageId: parsed.messageId ?? null,
      from: parsed.from?.text ?? '(unknown sender)',
      to: [...addresses(parsed.to), ...addresses(parsed.cc), ...addresses(parsed.bcc)],
      subject: parsed.subject ?? '(no subject)',
      text: parsed.text ?? null,
      html: typeof parsed.html === 'string' ? parsed.html : null,
      attachments: parsed.attachments.map((a) => ({
        filename: a.filename ?? 'attachment',
        contentType: a.contentType,
        size: a.size,
      })),
      raw,
    })
    .run();
}
