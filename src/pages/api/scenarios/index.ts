import { z } from 'zod';
import { endpoint, json, readJson, requireActor } from '../../../lib/http';
import { blankScenario } from '../../../lib/studio/document';
import { createScenario, importScenario, listScenarios } from '../../../lib/studio/library';

export const GET = endpoint(({ locals, url }) => {
  const actor = requireActor(locals);
  const query = url.searchParams.get('q') ?? '';
  const archived = url.searchParams.get('archived') === '1';
  return json({ scenarios: listScenarios(actor, { query, archived }) });
});

/** Either a title (a scenario from nothing) or a whole document (an imported file). */
const create = z.union([
  z.object({ title: z.string().trim().min(1, 'Give the scenario a title').max(200, 'At most 200 characters') }).strict(),
  z.object({ document: z.unknown() }).strict(),
], { error: 'Send {"title": "..."} for a new scenario or {"document": {...}} to import one' });

export const POST = endpoint(async ({ locals, request }) => {
  const actor = requireActor(locals);
  const input = await readJson(request, create);
  if ('title' in input) {
    return json(createScenario(actor, blankScenario(input.title), 'Created from nothing'), 201);
  }
  return json(importScenario(actor, input.document), 201);
});
