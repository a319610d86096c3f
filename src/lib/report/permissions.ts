/** What one reader may do with an exercise's report, as the access rules decide; the pages and the API share it. */
import { allowed, type Actor, type ExerciseContext } from '../access';

export type ReportPermissions = { edit: boolean; comment: boolean; readDraft: boolean; readIssued: boolean; issue: boolean; send: boolean };

export function reportPermissions(actor: Actor, ctx: ExerciseContext): ReportPermissions {
  return {
    edit: allowed(actor, 'report.edit', ctx),
    comment: allowed(actor, 'report.comment', ctx),
    readDraft: allowed(actor, 'report.readDraft', ctx),
    readIssued: allowed(actor, 'report.readIssued', ctx),
    issue: allowed(actor, 'report.issue', ctx),
    send: allowed(actor, 'report.send', ctx),
  };
}
