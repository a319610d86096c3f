/**
 * Briefing documents: PDF, PNG or JPEG files for everyone in an exercise or for
 * one team's private brief. A row belongs to the scenario and never changes;
 * a version's document lists the ids it includes. Adding or removing one edits
 * the document, so it follows the freeze rule like any other edit.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import { decide, type Actor, type Decision, type Seat } from '../access';
import { HttpError } from '../http';
import { teamsOf, type ScenarioDocument } from './document';
import { checkUpload, storeFile, typeName } from './files';
import { logChange, scenarioContext, scenarioFor, versionDocument, workingDraft, writeDraft } from './library';

export type AttachmentRow = typeof schema.attachment.$inferSelect;

export type AttachmentInfo = {
  id: string;
  teamId: string | null;
  filename: string;
  contentType: string;
  size: number;
  sha256: string;
  uploadedByName: string;
  createdAt: string;
};

/** The attachments a version lists, in its order. The live exercise filters them per viewer with `attachmentDecision`. */
export function attachmentsOfVersion(versionId: string): AttachmentInfo[] {
  const ids = versionDocument(versionId).attachments;
  if (ids.length === 0) return [];
  const rows = db()
    .select({ row: schema.attachment, uploadedByName: schema.user.name })
    .from(schema.attachment)
    .innerJoin(schema.user, eq(schema.user.id, schema.attachment.uploadedBy))
    .where(inArray(schema.attachment.id, ids))
    .all();
  const byId = new Map(rows.map((r) => [r.row.id, r]));
  return ids.flatMap((id) => {
    const found = byId.get(id);
    if (!found) return [];
    const { row, uploadedByName } = found;
    return [{ id, teamId: row.teamId, filename: row.filename, contentType: row.contentType, size: row.size, sha256: row.sha256, uploadedByName, createdAt: row.createdAt.toISOString() }];
  });
}

export function listAttachments(actor: Actor, scenarioId: string, versionId: string): AttachmentInfo[] {
  scenarioFor(actor, scenarioId, 'scenario.read');
  const version = db().select({ scenarioId: schema.scenarioVersion.scenarioId }).from(schema.scenarioVersion).where(eq(schema.scenarioVersion.id, versionId)).get();
  if (version?.scenarioId !== scenarioId) throw new HttpError(404, 'This scenario has no version with this id');
  return attachmentsOfVersion(versionId);
}

/** A file name safe to keep and to send back in a header: no path, no control characters. */
function cleanName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  const clean = base.replace(/[\u0000-\u001f\u007f"]/g, '').trim().slice(0, 200);
  return clean === '' ? 'document' : clean;
}

function checkTeam(document: ScenarioDocument, teamId: string | null): void {
  if (teamId === null) return;
  const teams = teamsOf(document);
  if (!teams.some((t) => t.id === teamId)) {
    throw new HttpError(400, `This scenario has no team "${teamId}"`, [{ field: 'teamId', reason: `not one of ${teams.map((t) => t.id).join(', ')}` }]);
  }
}

export type AttachmentChange = { versionId: string; revision: number; startedDraft: boolean; attachments: string[] };

export async function uploadAttachment(
  actor: Actor,
  scenarioId: string,
  input: { versionId: string; teamId: string | null; filename: string; bytes: Uint8Array },
): Promise<AttachmentChange & { attachment: AttachmentInfo }> {
  scenarioFor(actor, scenarioId, 'scenario.edit');
  const contentType = await checkUpload(input.bytes);
  const sha256 = storeFile(input.bytes);
  const filename = cleanName(input.filename);
  const id = crypto.randomUUID();
  const done = db().transaction((tx) => {
    const { draft, started } = workingDraft(tx, actor, scenarioId, input.versionId);
    const document = draft.document as ScenarioDocument;
    checkTeam(document, input.teamId);
    tx.insert(schema.attachment).values({ id, scenarioId, teamId: input.teamId, filename, contentType, size: input.bytes.byteLength, sha256, uploadedBy: actor.id }).run();
    const attachments = [...document.attachments, id];
    const revision = writeDraft(tx, draft, { ...document, attachments });
    const whose = input.teamId ? `the private brief of ${teamsOf(document).find((t) => t.id === input.teamId)!.name}` : 'the scenario';
    logChange(tx, draft.id, actor.id, `Attached “${filename}” (${typeName(contentType)}) to ${whose}`, [`attachments[${attachments.length - 1}]`]);
    return { versionId: draft.id, revision, startedDraft: started, attachments };
  });
  const attachment = attachmentsOfVersion(done.versionId).find((a) => a.id === id)!;
  return { ...done, attachment };
}

/** Take a document out of the working draft. Frozen versions that list it keep it. */
export function removeAttachment(actor: Actor, scenarioId: string, versionId: string, attachmentId: string): AttachmentChange {
  scenarioFor(actor, scenarioId, 'scenario.edit');
  return db().transaction((tx) => {
    const { draft, started } = workingDraft(tx, actor, scenarioId, versionId);
    const document = draft.document as ScenarioDocument;
    const at = document.attachments.indexOf(attachmentId);
    if (at < 0) throw new HttpError(404, 'This version does not list that briefing document');
    const row = tx.select({ filename: schema.attachment.filename }).from(schema.attachment).where(eq(schema.attachment.id, attachmentId)).get();
    const attachments = document.attachments.filter((id) => id !== attachmentId);
    const revision = writeDraft(tx, draft, { ...document, attachments });
    logChange(tx, draft.id, actor.id, `Removed “${row?.filename ?? attachmentId}”`, [`attachments[${at}]`]);
    return { versionId: draft.id, revision, startedDraft: started, attachments };
  });
}

function attachmentRow(attachmentId: string): AttachmentRow & { ownerId: string } {
  const found = db()
    .select({ row: schema.attachment, ownerId: schema.scenario.ownerId })
    .from(schema.attachment)
    .innerJoin(schema.scenario, eq(schema.scenario.id, schema.attachment.scenarioId))
    .where(eq(schema.attachment.id, attachmentId))
    .get();
  if (!found) throw new HttpError(404, 'No briefing document with this id');
  return { ...found.row, ownerId: found.ownerId };
}

/** The actor's seats in exercises run on versions of the scenario that list this attachment. */
function seatsWith(actorId: string, row: AttachmentRow): Seat[] {
  return db()
    .select({ role: schema.membership.role, teamId: schema.membership.teamId, isLead: schema.membership.isLead, document: schema.scenarioVersion.document })
    .from(schema.membership)
    .innerJoin(schema.exercise, eq(schema.exercise.id, schema.membership.exerciseId))
    .innerJoin(schema.scenarioVersion, eq(schema.scenarioVersion.id, schema.exercise.scenarioVersionId))
    .where(and(eq(schema.membership.userId, actorId), eq(schema.scenarioVersion.scenarioId, row.scenarioId)))
    .all()
    .filter((seat) => (seat.document as ScenarioDocument).attachments.includes(row.id))
    .map(({ role, teamId, isLead }) => ({ role, teamId, isLead }));
}

/** May this actor read this attachment? The live exercise uses it to list a team's documents. */
export function attachmentDecision(actor: Actor, attachmentId: string): Decision {
  const row = attachmentRow(attachmentId);
  return decide(actor, 'attachment.read', {
    scenario: scenarioContext(actor, { id: row.scenarioId, ownerId: row.ownerId }),
    teamId: row.teamId,
    seats: seatsWith(actor.id, row),
  });
}

/** The attachment row, once the access rules allow this actor to read it. */
export function readableAttachment(actor: Actor, attachmentId: string): AttachmentRow {
  const decision = attachmentDecision(actor, attachmentId);
  if (!decision.ok) throw new HttpError(decision.status, decision.reason);
  return attachmentRow(attachmentId);
}
