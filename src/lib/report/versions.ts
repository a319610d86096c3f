/** Issued versions of a report: frozen, numbered copies of the draft, with who issued them and when. */
import { and, asc, desc, eq, inArray, max } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import type { SessionUser } from '../auth';
import { HttpError } from '../http';
import type { IssuedReport } from './render/issued';
import type { JSONContent } from './schema';
import { draftJson } from './store';

const { reportVersion, reportDispatch } = schema;

export type VersionSummary = { id: string; number: number; title: string; issuedAt: Date; issuedByName: string };
export type Dispatch = { id: string; versionNumber: number; sentByName: string; recipients: string[]; note: string; sentAt: Date };

/** The report's title: the text of its first top-level heading, else one made from the exercise. */
export function reportTitle(content: JSONContent, exerciseTitle: string): string {
  const first = content.content?.find((n) => n.type === 'heading');
  const text = (first?.content ?? []).map((n) => n.text ?? '').join('').trim();
  return text || `After-action report: ${exerciseTitle}`;
}

function hasWords(content: JSONContent): boolean {
  const walk = (n: JSONContent): boolean => Boolean(n.text?.trim()) || n.type === 'analysisFigure' || n.type === 'analysisTable' || (n.content ?? []).some(walk);
  return walk(content);
}

export function issueVersion(exerciseId: string, exerciseTitle: string, issuer: SessionUser): VersionSummary {
  const content = draftJson(exerciseId);
  if (!hasWords(content)) throw new HttpError(409, 'The draft is empty; write something before issuing it');
  const title = reportTitle(content, exerciseTitle);
  return db().transaction((tx) => {
    const last = tx.select({ n: max(reportVersion.number) }).from(reportVersion).where(eq(reportVersion.exerciseId, exerciseId)).get()?.n ?? 0;
    const row = { id: crypto.randomUUID(), exerciseId, number: last + 1, title, content, issuedBy: issuer.id, issuedByName: issuer.name, issuedAt: new Date() };
    tx.insert(reportVersion).values(row).run();
    return { id: row.id, number: row.number, title, issuedAt: row.issuedAt, issuedByName: issuer.name };
  });
}

export function listVersions(exerciseId: string): VersionSummary[] {
  return db()
    .select({ id: reportVersion.id, number: reportVersion.number, title: reportVersion.title, issuedAt: reportVersion.issuedAt, issuedByName: reportVersion.issuedByName })
    .from(reportVersion)
    .where(eq(reportVersion.exerciseId, exerciseId))
    .orderBy(desc(reportVersion.number))
    .all();
}

export function getVersion(exerciseId: string, number: number, exerciseTitle: string): IssuedReport & { id: string } {
  const row = db().select().from(reportVersion).where(and(eq(reportVersion.exerciseId, exerciseId), eq(reportVersion.number, number))).get();
  if (!row) throw new HttpError(404, `This report has no version ${number}`);
  return { id: row.id, title: row.title, exerciseTitle, number: row.number, issuedAt: row.issuedAt, issuedByName: row.issuedByName, content: row.content as JSONContent };
}

export function listDispatches(exerciseId: string): Dispatch[] {
  const versions = db().select({ id: reportVersion.id, number: reportVersion.number }).from(reportVersion).where(eq(reportVersion.exerciseId, exerciseId)).all();
  if (versions.length === 0) return [];
  const numberOf = new Map(versions.map((v) => [v.id, v.number]));
  return db()
    .select()
    .from(reportDispatch)
    .where(inArray(reportDispatch.versionId, versions.map((v) => v.id)))
    .orderBy(asc(reportDispatch.sentAt))
    .all()
    .map((d) => ({ id: d.id, versionNumber: numberOf.get(d.versionId)!, sentByName: d.sentByName, recipients: d.recipients, note: d.note, sentAt: d.sentAt }));
}

export function recordDispatch(versionId: string, sender: SessionUser, recipients: string[], note: string, messageId: string): void {
  db().insert(reportDispatch).values({ id: crypto.randomUUID(), versionId, sentBy: sender.id, sentByName: sender.name, recipients, note, messageId, sentAt: new Date() }).run();
}
