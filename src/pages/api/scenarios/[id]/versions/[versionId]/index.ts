import { z } from 'zod';
import { endpoint, json, readJson, requireActor } from '../../../../../../lib/http';
import { saveDocument, versionView } from '../../../../../../lib/studio/library';

export const GET = endpoint(({ locals, params }) => json(versionView(requireActor(locals), params.id!, params.versionId!)));

const save = z
  .object({
    revision: z.number({ error: 'revision must be the number the draft had when you opened it' }).int().min(0),
    document: z.unknown().refine((d) => d !== undefined, 'the scenario document is missing'),
    /** A ladder being edited that does not build yet; null when there is none. */
    ladderDraft: z.unknown().optional(),
  })
  .strict();

export const PUT = endpoint(async ({ locals, params, request }) => {
  const actor = requireActor(locals);
  const input = await readJson(request, save);
  return json(saveDocument(actor, params.id!, params.versionId!, input));
});
