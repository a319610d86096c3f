/**
 * The plain tree format for analysts:
 *   {"teams": ["Blue", "Red"], "root": NODE}
 *   NODE = {"team": "Blue", "infoset": "optional id", "actions": [{"label": "Hold", "next": NODE}]}
 *        | {"chance": [{"label": "Storm", "p": "1/4", "next": NODE}]}
 *        | {"payoffs": [2, "1/3"]}            (in the order of teams)
 * Team names are the team ids; node ids are derived from the path (see ids.ts).
 */
import { ROOT_ID, childId, siblingKeys, slug } from './ids';
import type { Game, GameNode } from './model';
import { formatPath, validateGame, type Fault } from './validate';

export type Parsed = { ok: true; game: Game } | { ok: false; faults: Fault[] };

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

type Part = string | number;

export function parsePlainGame(input: unknown): Parsed {
  if (!isRecord(input)) return shapeFault([], 'the file must be a JSON object with "teams" and "root"');
  const teams = input.teams;
  if (!Array.isArray(teams) || teams.some((t) => typeof t !== 'string')) {
    return shapeFault(['teams'], 'teams must be a list of team names');
  }
  const names = teams as string[];
  const faults: Fault[] = [];
  const root = convert(input.root, ['root'], ROOT_ID, names, faults);
  if (faults.length > 0 || !root) return { ok: false, faults };
  const validated = validateGame({ teams: names.map((name) => ({ id: name, name })), root });
  if (validated.ok) return validated;
  return { ok: false, faults: validated.faults.map((f) => ({ ...f, path: plainPath(f.path, names) })) };
}

function shapeFault(parts: Part[], message: string): Parsed {
  return { ok: false, faults: [{ code: 'shape', path: formatPath(parts), message }] };
}

/** Convert a plain node to a model node, reporting what cannot be read. */
function convert(raw: unknown, parts: Part[], id: string, teams: string[], faults: Fault[]): GameNode | null {
  const fault = (message: string) => {
    faults.push({ code: 'shape', path: formatPath(parts), message });
    return null;
  };
  if (!isRecord(raw)) return fault('a node must be an object with "team" and "actions", "chance", or "payoffs"');
  if ('payoffs' in raw) {
    const payoffs = raw.payoffs;
    if (!Array.isArray(payoffs)) return fault('payoffs must be a list, one value per team in the order of teams');
    if (payoffs.length !== teams.length) {
      return fault(`payoffs has ${payoffs.length} values but there are ${teams.length} teams`);
    }
    return { id, kind: 'terminal', payoffs: Object.fromEntries(teams.map((t, i) => [t, payoffs[i] as number])) };
  }
  const edgeKey = 'chance' in raw ? 'chance' : 'actions';
  const edges = raw[edgeKey];
  if (!('chance' in raw) && !('team' in raw)) {
    return fault('a node must be an object with "team" and "actions", "chance", or "payoffs"');
  }
  if (!Array.isArray(edges) || edges.length === 0) return fault(`${edgeKey} must be a non-empty list`);
  const keys = siblingKeys(edges.map((e) => slug(isRecord(e) && typeof e.label === 'string' ? e.label : 'x')));
  const children = edges.map((edge, i) => {
    const edgeParts = [...parts, edgeKey, i];
    if (!isRecord(edge)) {
      faults.push({ code: 'shape', path: formatPath(edgeParts), message: 'each entry must be an object with "label" and "next"' });
      return null;
    }
    const next = convert(edge.next, [...edgeParts, 'next'], childId(id, keys[i]!), teams, faults);
    return next ? { ...edge, next } : null;
  });
  if (children.some((c) => c === null)) return null;
  if (edgeKey === 'chance') return { id, kind: 'chance', outcomes: children } as GameNode;
  const infoset = raw.infoset;
  return { id, kind: 'decision', team: raw.team, ...(infoset !== undefined ? { infoset } : {}), actions: children } as GameNode;
}

/** Model fault paths back in the plain file's terms: "outcomes" is "chance", payoffs are by position. */
function plainPath(path: string, teams: string[]): string {
  return path
    .replace(/\.outcomes(?=\[|\.|$)/g, '.chance')
    .replace(/\.payoffs\.(.+)$/, (_, team: string) => {
      const i = teams.indexOf(team);
      return i >= 0 ? `.payoffs[${i}]` : `.payoffs.${team}`;
    });
}
