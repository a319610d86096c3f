/** Comments on the draft: people who may comment but not edit leave them beside the text. */
import { and, asc, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { db, schema } from '../../db/client';
import type { SessionUser } from '../auth';
import { HttpError } from '../http';

const { reportComment } = schema;

export const commentSchema = z.object({
  body: z.string().trim().min(1, { error: 'write the comment' }).max(4000, { error: 'at most 4000 characters' }),
  quote: z.string().trim().max(1000, { error: 'quote at most 1000 characters' }).optional(),
});

export type ReportComment = { id: string; authorName: string; quote: string | null; body: string; createdAt: Date; resolvedAt: Date | null };

export function listComments(exerciseId: string): ReportComment[] {
  return db()
    .select({ id: reportComment.id, authorName: reportComment.authorName, quote: reportComment.quote, body: reportComment.body, createdAt: reportComment.createdAt, resolvedAt: reportComment.resolvedAt })
    .from(reportComment)
    .where(eq(reportComment.exerciseId, exerciseId))
    .orderBy(asc(reportComment.createdAt))
    .all();
}

export function addComment(exerciseId: string, author: SessionUser, input: z.infer<typeof commentSchema>): ReportComment {
  const row = { id: crypto.randomUUID(), exerciseId, authorId: author.id, authorName: author.name, quote: input.quote || null, body: input.body, createdAt: new Date(), resolvedAt: null };
  db().insert(reportComment).values(row).run();
  return { id: row.id, authorName: row.authorName, quote: row.quote, body: row.body, createdAt: row.createdAt, resolvedAt: null };
}

export function resolveComment(exerciseId: string, commentId: string): void {
  const result = db()
    .update(reportComment)
    .set({ resolvedAt: new Date() })
    .where(and(eq(reportComment.exerciseId, exerciseId), eq(reportComment.id, commentId), isNull(reportComment.resolvedAt)))
    .run();
  if (result.changes === 0) throw new HttpError(404, 'No such open comment on this report');
}
