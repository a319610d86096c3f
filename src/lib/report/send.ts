/** Sending an issued version to sponsors: a covering note, the PDF attached, and a record of the send. */
import { z } from 'zod';
import type { SessionUser } from '../auth';
import { sendMail } from '../mail';
import { reportPdf } from './render/pdf';
import { CAUTION, issuedLine, type IssuedReport } from './render/issued';
import { escapeXml as escape } from './render/svg';
import { recordDispatch } from './versions';

export const MAX_RECIPIENTS = 30;

export const sendSchema = z.object({
  to: z
    .array(z.string().trim().toLowerCase().pipe(z.email({ error: 'must be an e-mail address' })))
    .min(1, { error: 'add at least one address' })
    .max(MAX_RECIPIENTS, { error: `at most ${MAX_RECIPIENTS} addresses` })
    .transform((list) => [...new Set(list)]),
  note: z.string().trim().min(1, { error: 'write a covering note' }).max(5000, { error: 'at most 5000 characters' }),
});

export type SendRequest = z.infer<typeof sendSchema>;

export function pdfFilename(report: IssuedReport): string {
  const slug = report.exerciseTitle.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'exercise';
  return `rungwise-report-${slug}-v${report.number}.pdf`;
}

export function reportMail(report: IssuedReport, note: string, senderName: string) {
  const subject = `EXERCISE · ${report.title} (version ${report.number})`;
  const paragraphs = [...note.split(/\n{2,}/), `${issuedLine(report)}. The report is attached as a PDF.`, `Sent by ${senderName} through Rungwise.`, CAUTION];
  return {
    subject,
    text: ['EXERCISE · EXERCISE · EXERCISE', ...paragraphs].join('\n\n'),
    html: `<div style="font-family:sans-serif;line-height:1.5"><p style="font-weight:600;letter-spacing:.2em">EXERCISE · EXERCISE · EXERCISE</p>${paragraphs.map((p) => `<p>${escape(p).replace(/\n/g, '<br>')}</p>`).join('')}</div>`,
  };
}

export async function sendVersion(report: IssuedReport & { id: string }, sender: SessionUser, request: SendRequest): Promise<{ messageId: string; filename: string }> {
  const pdf = await reportPdf(report);
  const filename = pdfFilename(report);
  const messageId = await sendMail({
    to: request.to,
    ...reportMail(report, request.note, sender.name),
    attachments: [{ filename, content: pdf, contentType: 'application/pdf' }],
  });
  recordDispatch(report.id, sender, request.to, request.note, messageId);
  return { messageId, filename };
}
