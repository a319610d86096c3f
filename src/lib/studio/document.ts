/**
 * The Studio's view of a scenario document (src/lib/scenario.ts): checks for a
 * draft and for an imported file, a blank scenario to start from, and the few
 * facts the library reads (title, search summary, teams).
 */
import { buildLadder, type LadderSpec } from '../engine';
import type { FieldError } from '../http';
import { parseScenario, SCENARIO_FORMAT, ScenarioSchema, type Scenario, type ScenarioFault } from '../scenario';

export type ScenarioDocument = Scenario;
export type Fault = ScenarioFault;

export function faultFields(faults: Fault[]): FieldError[] {
  return faults.map((f) => ({ field: f.path || '(document)', reason: f.message }));
}

export type DraftCheck = { ok: true; document: Scenario; faults: Fault[] } | { ok: false; faults: Fault[] };

/**
 * A draft may be saved while it still has faults of meaning (probabilities that
 * do not sum to 1, a dangling mark), so that nothing the author typed is lost;
 * it must have the document's shape. The faults come back with it.
 */
export function checkDraft(raw: unknown): DraftCheck {
  const full = parseScenario(raw);
  if (full.ok) return { ok: true, document: full.scenario, faults: [] };
  const shape = ScenarioSchema.safeParse(raw);
  return shape.success ? { ok: true, document: shape.data, faults: full.faults } : { ok: false, faults: full.faults };
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Fields of `raw` that the schema does not know (parsing would drop them silently). */
function unknownFields(raw: unknown, parsed: unknown, path = ''): Fault[] {
  if (Array.isArray(raw) && Array.isArray(parsed)) {
    return raw.flatMap((item, i) => unknownFields(item, parsed[i], `${path}[${i}]`));
  }
  if (!isRecord(raw) || !isRecord(parsed)) return [];
  return Object.keys(raw).flatMap((key) => {
    const at = path === '' ? key : `${path}.${key}`;
    return key in parsed ? unknownFields(raw[key], parsed[key], at) : [{ path: at, message: 'is not a field of a Rungwise scenario' }];
  });
}

/** An imported file must be a whole, sound scenario: every fault, of shape or meaning, is listed by path. */
export function checkImport(raw: unknown): { ok: true; document: Scenario } | { ok: false; faults: Fault[] } {
  if (isRecord(raw) && raw.format !== SCENARIO_FORMAT) {
    return { ok: false, faults: [{ path: 'format', message: `must be "${SCENARIO_FORMAT}": this is not a Rungwise scenario file, or one of another format version` }] };
  }
  const parsed = parseScenario(raw);
  if (!parsed.ok) return parsed;
  const unknown = unknownFields(raw, parsed.scenario);
  return unknown.length > 0 ? { ok: false, faults: unknown } : { ok: true, document: parsed.scenario };
}

const PART_NAMES: Record<string, string> = {
  format: 'the format',
  title: 'the title',
  setting: 'the setting',
  brief: 'the general brief',
  teams: 'the teams',
  attributes: 'the attributes',
  weights: 'the weights',
  ladder: 'the ladder',
  tree: 'the tree',
  marks: 'threats and promises',
  payoffRanges: 'payoff ranges',
  injects: 'injects',
  attachments: 'documents',
};

export function partName(segment: string): string {
  return PART_NAMES[segment] ?? segment;
}

export function titleOf(document: Scenario): string {
  return document.title;
}

export function summaryOf(document: Scenario): string {
  return document.setting.replace(/\s+/g, ' ').trim().slice(0, 240);
}

export function teamsOf(document: Scenario): { id: string; name: string }[] {
  return document.teams.map((t) => ({ id: t.id, name: t.name }));
}

export function retitled(document: Scenario, title: string): Scenario {
  return { ...document, title: title.slice(0, 300) };
}

export function exportText(document: Scenario): string {
  return `${JSON.stringify(document, null, 2)}\n`;
}

export function exportFileName(document: Scenario): string {
  const base = document.title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60);
  return `${base || 'scenario'}.rungwise.json`;
}

/** The ladder a new scenario starts with: three rungs, two rounds, two teams. */
const STARTER_LADDER: LadderSpec = {
  rungs: [
    { key: 'talks', name: 'Talks', intensity: 0, description: 'Both sides keep to diplomatic channels.', attributes: { cost: 0, credibility: 0 } },
    { key: 'pressure', name: 'Pressure', intensity: 1, description: 'Public warnings and economic measures.', attributes: { cost: 1, credibility: 1 } },
    { key: 'clash', name: 'Armed clash', intensity: 2, description: 'Forces exchange fire.', attributes: { cost: 6, credibility: 2 } },
  ],
  start: 0,
  rounds: 2,
  parties: ['blue', 'red'],
  moves: { climbUpTo: 1, hold: true, stepDown: true, settle: false },
  flows: ['cost'],
};

export function blankScenario(title: string): Scenario {
  const teams = [
    { id: 'blue', name: 'Blue', objectives: [] },
    { id: 'red', name: 'Red', objectives: [] },
  ];
  const attributes = [
    { key: 'cost', label: 'Cost', direction: 'less-is-better' as const },
    { key: 'credibility', label: 'Credibility', direction: 'more-is-better' as const },
  ];
  const built = buildLadder(STARTER_LADDER, teams, attributes.map((a) => a.key));
  if (!built.ok) throw new Error(`the starter ladder does not build: ${built.faults.map((f) => f.message).join('; ')}`);
  return {
    format: SCENARIO_FORMAT,
    title,
    setting: '',
    teams,
    attributes,
    weights: { blue: { cost: 1, credibility: 2 }, red: { cost: 1, credibility: 1 } },
    ladder: STARTER_LADDER,
    tree: built.root,
    marks: [],
    payoffRanges: [],
    injects: [],
    attachments: [],
  };
}
