/**
 * A whole Rungwise scenario document: the import/export file and what the app stores per
 * scenario version. It wraps the engine's game model (teams, attributes, weights, the
 * tree) with the briefing material, the ladder it was generated from, the threats and
 * promises the author marks, payoff ranges for Monte Carlo, pre-authored injects and
 * attachment references.
 */
import { z } from 'zod';
import {
  AttributeSchema,
  GameNodeSchema,
  LadderSpecSchema,
  NumSchema,
  WeightsSchema,
  buildLadder,
  childEdges,
  indexGame,
  toFloat,
  validateGame,
  type Game,
  type GameNode,
} from './engine';

export const SCENARIO_FORMAT = 'rungwise.scenario/1';
export const SCENARIO_SCHEMA_ID = 'https://rungwise.example/schemas/scenario-1.json';

/** Rich text as Tiptap/ProseMirror JSON: {type: "doc", content: [...]}. */
export interface RichTextNode {
  type: string;
  attrs?: Record<string, unknown>;
  content?: RichTextNode[];
  marks?: { type: string; attrs?: Record<string, unknown> }[];
  text?: string;
}

const RichTextNodeSchema: z.ZodType<RichTextNode> = z
  .object({
    type: z.string().min(1),
    attrs: z.record(z.string(), z.unknown()).optional(),
    get content(): z.ZodOptional<z.ZodArray<z.ZodType<RichTextNode>>> {
      return z.array(RichTextNodeSchema).optional();
    },
    marks: z.array(z.object({ type: z.string().min(1), attrs: z.record(z.string(), z.unknown()).optional() })).optional(),
    text: z.string().optional(),
  })
  .meta({ id: 'RichTextNode' });

export const RichTextSchema = z
  .object({ type: z.literal('doc'), content: z.array(RichTextNodeSchema) })
  .meta({ id: 'RichText', description: 'Tiptap/ProseMirror document JSON.' });

export type RichText = z.infer<typeof RichTextSchema>;

const Id = z.string().min(1).max(200);

export const ScenarioTeamSchema = z.object({
  id: Id,
  name: z.string().min(1).max(200),
  objectives: z.array(z.string().min(1).max(1000)).max(20),
  /** Private brief, shown only to this team and the facilitators. */
  brief: RichTextSchema.optional(),
  colour: z
    .string()
    .regex(/^#[0-9a-fA-F]{6}$/, { error: 'must be a colour like "#2f6db3"' })
    .optional(),
});

export const MarkSchema = z.object({
  nodeId: Id,
  action: z.string().min(1),
  kind: z.enum(['threat', 'promise']),
  note: z.string().max(2000).optional(),
});

export const PayoffDistributionSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('uniform'), low: NumSchema, high: NumSchema }),
  z.object({ kind: z.literal('triangular'), low: NumSchema, mode: NumSchema, high: NumSchema }),
]);

export const PayoffRangeSchema = z.object({ nodeId: Id, team: Id, distribution: PayoffDistributionSchema });

export const InjectSchema = z.object({
  id: Id,
  /** The node at which the inject is due, or null for one the facilitator releases at will. */
  nodeId: Id.nullable(),
  to: z.union([z.literal('all'), z.array(Id).min(1)]),
  title: z.string().min(1).max(300),
  body: RichTextSchema,
});

export const ScenarioSchema = z
  .object({
    format: z.literal(SCENARIO_FORMAT, { error: `must be "${SCENARIO_FORMAT}"` }),
    title: z.string().min(1).max(300),
    setting: z.string().max(2000),
    brief: RichTextSchema.optional(),
    teams: z.array(ScenarioTeamSchema).min(2).max(6),
    attributes: z.array(AttributeSchema),
    weights: WeightsSchema,
    ladder: LadderSpecSchema.optional(),
    tree: GameNodeSchema,
    marks: z.array(MarkSchema),
    payoffRanges: z.array(PayoffRangeSchema),
    injects: z.array(InjectSchema),
    attachments: z.array(Id),
  })
  .meta({ id: 'Scenario', title: 'Rungwise scenario' });

export type Scenario = z.infer<typeof ScenarioSchema>;
export type ScenarioFault = { path: string; message: string };
export type ParsedScenario = { ok: true; scenario: Scenario } | { ok: false; faults: ScenarioFault[] };

/** The JSON Schema of a scenario document (committed as scenarios/schema.json). */
export function scenarioJsonSchema(): Record<string, unknown> {
  return { $id: SCENARIO_SCHEMA_ID, ...z.toJSONSchema(ScenarioSchema, { target: 'draft-2020-12' }) };
}

/** The text of scenarios/schema.json. */
export function scenarioJsonSchemaText(): string {
  return `${JSON.stringify(scenarioJsonSchema(), null, 2)}\n`;
}

/** The engine's game model of a scenario. */
export function scenarioGame(scenario: Pick<Scenario, 'teams' | 'attributes' | 'weights' | 'ladder' | 'tree'>): Game {
  return {
    teams: scenario.teams.map((t) => ({ id: t.id, name: t.name })),
    attributes: scenario.attributes,
    weights: scenario.weights,
    ...(scenario.ladder ? { rungs: scenario.ladder.rungs } : {}),
    root: scenario.tree as GameNode,
  };
}

const ShellSchema = ScenarioSchema.extend({ tree: z.unknown() });

function zodPath(parts: readonly PropertyKey[]): string {
  return parts.reduce<string>((out, p) => (typeof p === 'number' ? `${out}[${p}]` : out === '' ? String(p) : `${out}.${String(p)}`), '');
}

/** Engine fault paths are relative to the game; in the document the tree is "tree" and rungs sit in the ladder. */
function documentPath(path: string): string {
  return path.replace(/^root/, 'tree').replace(/^rungs/, 'ladder.rungs');
}

/** Parse and check a scenario document; every fault names its path. */
export function parseScenario(json: unknown): ParsedScenario {
  const shell = ShellSchema.safeParse(json);
  if (!shell.success) {
    return { ok: false, faults: shell.error.issues.map((i) => ({ path: zodPath(i.path), message: i.message })) };
  }
  const doc = shell.data;
  const checked = validateGame(scenarioGame({ ...doc, tree: doc.tree as GameNode }));
  if (!checked.ok) return { ok: false, faults: checked.faults.map((f) => ({ path: documentPath(f.path), message: f.message })) };
  const scenario: Scenario = { ...doc, tree: checked.game.root };
  const faults = crossReferences(scenario, checked.game);
  return faults.length > 0 ? { ok: false, faults } : { ok: true, scenario };
}

function crossReferences(scenario: Scenario, game: Game): ScenarioFault[] {
  const faults: ScenarioFault[] = [];
  const fault = (path: string, message: string) => faults.push({ path, message });
  const index = indexGame(game);
  const teamIds = new Set(scenario.teams.map((t) => t.id));
  scenario.marks.forEach((mark, i) => {
    const node = index.byId.get(mark.nodeId);
    if (!node || node.kind !== 'decision') fault(`marks[${i}].nodeId`, `"${mark.nodeId}" is not a decision node of the tree`);
    else if (!node.actions.some((a) => a.label === mark.action)) fault(`marks[${i}].action`, `there is no action "${mark.action}" at "${mark.nodeId}"`);
  });
  scenario.payoffRanges.forEach((range, i) => {
    const node = index.byId.get(range.nodeId);
    if (!node || node.kind !== 'terminal') fault(`payoffRanges[${i}].nodeId`, `"${range.nodeId}" is not a terminal node of the tree`);
    if (!teamIds.has(range.team)) fault(`payoffRanges[${i}].team`, `unknown team "${range.team}"`);
    const d = range.distribution;
    const low = toFloat(d.low);
    const high = toFloat(d.high);
    if (low > high) fault(`payoffRanges[${i}].distribution`, 'low must not exceed high');
    if (d.kind === 'triangular' && !(low <= toFloat(d.mode) && toFloat(d.mode) <= high)) fault(`payoffRanges[${i}].distribution.mode`, 'the mode must lie between low and high');
  });
  const injectIds = new Set<string>();
  scenario.injects.forEach((inject, i) => {
    if (injectIds.has(inject.id)) fault(`injects[${i}].id`, `inject id "${inject.id}" is used twice`);
    injectIds.add(inject.id);
    if (inject.nodeId !== null && !index.byId.has(inject.nodeId)) fault(`injects[${i}].nodeId`, `"${inject.nodeId}" is not a node of the tree`);
    if (inject.to !== 'all') inject.to.forEach((t, k) => {
      if (!teamIds.has(t)) fault(`injects[${i}].to[${k}]`, `unknown team "${t}"`);
    });
  });
  return faults;
}

export interface Regenerated {
  scenario: Scenario;
  /** References that no longer resolve in the new tree (the Studio should warn and let the author fix them). */
  dangling: { marks: number[]; payoffRanges: number[]; injects: number[] };
}

/** Rebuild the tree from the scenario's ladder. Ids of nodes whose path still exists are kept. */
export function regenerateTree(scenario: Scenario): { ok: true; result: Regenerated } | { ok: false; faults: ScenarioFault[] } {
  if (!scenario.ladder) return { ok: false, faults: [{ path: 'ladder', message: 'this scenario has no ladder to generate a tree from' }] };
  const built = buildLadder(scenario.ladder, scenario.teams, scenario.attributes.map((a) => a.key));
  if (!built.ok) return { ok: false, faults: built.faults.map((f) => ({ path: f.path, message: f.message })) };
  const next: Scenario = { ...scenario, tree: built.root };
  const index = indexGame(scenarioGame(next));
  const has = (id: string, kind?: GameNode['kind']) => {
    const node = index.byId.get(id);
    return node !== undefined && (kind === undefined || node.kind === kind);
  };
  const dangling = {
    marks: scenario.marks.flatMap((m, i) => {
      const node = index.byId.get(m.nodeId);
      return node && childEdges(node).some((e) => e.label === m.action) ? [] : [i];
    }),
    payoffRanges: scenario.payoffRanges.flatMap((r, i) => (has(r.nodeId, 'terminal') ? [] : [i])),
    injects: scenario.injects.flatMap((inj, i) => (inj.nodeId === null || has(inj.nodeId) ? [] : [i])),
  };
  return { ok: true, result: { scenario: next, dangling } };
}
