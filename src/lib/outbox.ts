/** Reading the mail captured by the built-in sink. */
import { desc, eq } from 'drizzle-orm';
import { simpleParser } from 'mailparser';
import { db, schema } from '../db/client';
import { HttpError } from './http';

export function listMessages(limit = 200) {
  return db()
    .select({
      id: schema.mailMessage.id,
      from: schema.mailMessage.from,
      to: schema.mailMessage.to,
      subject: schema.mailMessage.subject,
      attachments: schema.mailMessage.attachments,
      receivedAt: schema.mailMessage.receivedAt,
    })
    .from(schema.mailMessage)
    .orderBy(desc(schema.mailMessage.receivedAt))
    .limit(limit)
    .all();
}

function findMessage(id: string) {
  const row = db().select().from(schema.mailMessage).where(eq(schema.mailMessage.id, id)).get();
  if (!row) throw new HttpError(404, 'No such message in the outbox');
  return row;
}

export function getMessage(id: string) {
  const { raw: _raw, ...message } = findMessage(id);
  return message;
}

export async function getAttachment(id: string, index: number) {
  const parsed = await simpleParser(findMessage(id).raw);
  const attachment = parsed.attachments[index];
  if (!attachment) throw new HttpError(404, 'This message has no such attachment');
  return { filename: attachment.filename ?? `attachment-${index + 1}`, contentType: attachment.contentType, content: attachment.content };
}
