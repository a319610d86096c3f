/** Reading what the built-in mail sink captured, through the admin Outbox API. */
import type { Client } from './app';

export type OutboxSummary = { id: string; to: string[]; subject: string; attachments: { filename: string; contentType: string; size: number }[] };
export type OutboxMessage = OutboxSummary & { text: string | null; html: string | null };

/** Wait until a message to `address` whose subject matches arrives; returns it in full. */
export async function waitForMail(admin: Client, address: string, subject: RegExp, timeoutMs = 10_000): Promise<OutboxMessage> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const { body } = await admin.json<{ messages: OutboxSummary[] }>('/api/outbox');
    const found = body.messages.find((m) => m.to.includes(address) && subject.test(m.subject));
    if (found) return (await admin.json<{ message: OutboxMessage }>(`/api/outbox/${found.id}`)).body.message;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`No mail to ${address} matching ${subject} within ${timeoutMs} ms`);
}

export function linkIn(message: OutboxMessage, path: string): string {
  const match = new RegExp(`https?://[^\\s"]+${path.replace(/[/?]/g, '\\$&')}[^\\s"]*`).exec(message.text ?? '');
  if (!match) throw new Error(`No ${path} link in: ${message.text}`);
  return match[0];
}
