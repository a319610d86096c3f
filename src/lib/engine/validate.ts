/**
 * Validation of a game model. Each fault names where it is (the JSON path, and the
 * path of labels from the root for faults inside the tree) and what is wrong.
 */
import type { z } from 'zod';
import { Fraction, parseExact } from './numbers';
import {
  DEFAULT_MAX_NODES,
  GameSchema,
  childEdges,
  type DecisionNode,
  type Game,
  type GameNode,
} from './model';

export type FaultCode =
  | 'shape'
  | 'too-large'
  | 'duplicate-team'
  | 'duplicate-id'
  | 'duplicate-label'
  | 'unknown-team'
  | 'unknown-attribute'
  | 'unknown-rung'
  | 'payoff-missing'
  | 'payoff-not-finite'
  | 'probability-range'
  | 'probability-sum'
  | 'infoset-teams'
  | 'infoset-actions'
  | 'infoset-id-clash'
  | 'perfect-recall';

export interface Fault {
  code: FaultCode;
  /** JSON path inside the validated document, e.g. "root.actions[1].next.payoffs.Red". */
  path: string;
  /** Id of the node the fault is about, when it is about one. */
  nodeId?: string;
  message: string;
}

export interface ValidateOptions {
  maxNodes?: number;
}

export type Validated = { ok: true; game: Game } | { ok: false; faults: Fault[] };

/** Deepest tree the checks accept; deeper input is reported rather than risking the stack. */
const MAX_DEPTH = 2_000;

type PathPart = string | number;

export function formatPath(parts: readonly PathPart[]): string {
  let out = '';
  for (const part of parts) {
    if (typeof part === 'number') out += `[${part}]`;
    else out += out === '' ? part : `.${part}`;
  }
  return out;
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;

/** Count nodes and depth of a raw tree without trusting its shape. */
function measureRaw(root: unknown): { nodes: number; depth: number } {
  let nodes = 0;
  let depth = 0;
  const stack: [unknown, number][] = [[root, 1]];
  while (stack.length > 0) {
    const [node, d] = stack.pop()!;
    if (!isRecord(node)) continue;
    nodes++;
    depth = Math.max(depth, d);
    for (const key of ['actions', 'outcomes']) {
      const edges = node[key];
      if (Array.isArray(edges)) for (const e of edges) if (isRecord(e)) stack.push([e.next, d + 1]);
    }
  }
  return { nodes, depth };
}

/** Labels of the tree edges a raw JSON path passes through, e.g. "Climb 1 › Hold". */
function labelsAlong(doc: unknown, parts: readonly PathPart[]): string[] {
  const labels: string[] = [];
  let cursor: unknown = doc;
  for (let i = 0; i < parts.length && isRecord(cursor); i++) {
    const part = parts[i]!;
    const next: unknown = (cursor as Record<string | number, unknown>)[part];
    if ((parts[i - 1] === 'actions' || parts[i - 1] === 'outcomes') && isRecord(next) && parts[i + 1] === 'next') {
      labels.push(typeof next.label === 'string' ? next.label : `#${part}`);
    }
    cursor = next;
  }
  return labels;
}

function whereInTree(labels: string[]): string {
  return labels.length === 0 ? 'at the root' : `at ${labels.join(' › ')}`;
}

function shapeFault(doc: unknown, issue: z.core.$ZodIssue): Fault {
  const parts = issue.path as PathPart[];
  const last = parts[parts.length - 1];
  const parent = parts[parts.length - 2];
  const inTree = parts[0] === 'root';
  const where = inTree ? `${whereInTree(labelsAlong(doc, parts))}: ` : '';
  let code: FaultCode = 'shape';
  let message = issue.message;
  if (parent === 'payoffs' || last === 'payoffs') {
    code = 'payoff-not-finite';
    message = `payoff${typeof last === 'string' && last !== 'payoffs' ? ` for ${last}` : ''} ${issue.message}`;
  } else if (last === 'p') {
    code = 'probability-range';
    message = `probability ${issue.message}`;
  }
  return { code, path: formatPath(parts), message: where + message };
}

/** Check a game model. Returns the typed game, or every fault found. */
export function validateGame(input: unknown, options: ValidateOptions = {}): Validated {
  const maxNodes = options.maxNodes ?? DEFAULT_MAX_NODES;
  if (isRecord(input)) {
    const size = measureRaw(input.root);
    if (size.nodes > maxNodes) {
      return fail({
        code: 'too-large',
        path: 'root',
        message: `the tree has ${size.nodes} nodes, over the limit of ${maxNodes}`,
      });
    }
    if (size.depth > MAX_DEPTH) {
      return fail({
        code: 'too-large',
        path: 'root',
        message: `the tree is ${size.depth} levels deep, over the limit of ${MAX_DEPTH}`,
      });
    }
  }
  const parsed = GameSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, faults: parsed.error.issues.map((issue) => shapeFault(input, issue)) };
  }
  const game = parsed.data as Game;
  const faults = new Checker(game).run();
  return faults.length > 0 ? { ok: false, faults } : { ok: true, game };
}

function fail(fault: Fault): Validated {
  return { ok: false, faults: [fault] };
}

interface Visit {
  node: GameNode;
  parts: PathPart[];
  labels: string[];
  /** Earlier moves on the path: team, choice key, label. */
  history: { team: string; key: string; label: string }[];
}

/** The meaning checks, run on a game whose shape is already valid. */
class Checker {
  private faults: Fault[] = [];
  private readonly teamIds: Set<string>;
  private readonly attributeKeys: Set<string> | null;
  private readonly seenIds = new Map<string, string>();
  private readonly infosets = new Map<string, { first: Visit; members: Visit[] }>();

  constructor(private readonly game: Game) {
    this.teamIds = new Set(game.teams.map((t) => t.id));
    this.attributeKeys = game.attributes ? new Set(game.attributes.map((a) => a.key)) : null;
  }

  run(): Fault[] {
    this.checkTeams();
    this.checkWeights();
    this.walk();
    this.checkInfosets();
    return this.faults;
  }

  private add(code: FaultCode, parts: PathPart[], message: string, visit?: Visit) {
    const where = visit ? `${whereInTree(visit.labels)}: ` : '';
    this.faults.push({
      code,
      path: formatPath(parts),
      ...(visit ? { nodeId: visit.node.id } : {}),
      message: where + message,
    });
  }

  private checkTeams() {
    const seen = new Set<string>();
    this.game.teams.forEach((team, i) => {
      if (seen.has(team.id)) this.add('duplicate-team', ['teams', i, 'id'], `team id "${team.id}" is used twice`);
      seen.add(team.id);
    });
  }

  private checkWeights() {
    for (const [teamId, weights] of Object.entries(this.game.weights ?? {})) {
      if (!this.teamIds.has(teamId)) {
        this.add('unknown-team', ['weights', teamId], `weights are given for unknown team "${teamId}"`);
      }
      for (const key of Object.keys(weights)) {
        if (this.attributeKeys && !this.attributeKeys.has(key)) {
          this.add('unknown-attribute', ['weights', teamId, key], `weight for unknown attribute "${key}"`);
        }
      }
    }
  }

  private walk() {
    const stack: Visit[] = [{ node: this.game.root, parts: ['root'], labels: [], history: [] }];
    while (stack.length > 0) {
      const visit = stack.pop()!;
      this.checkNode(visit);
      const { node } = visit;
      const edgeKey = node.kind === 'decision' ? 'actions' : 'outcomes';
      const edges = childEdges(node);
      for (let i = edges.length - 1; i >= 0; i--) {
        const edge = edges[i]!;
        const history =
          node.kind === 'decision'
            ? [...visit.history, { team: node.team, key: node.infoset ?? node.id, label: edge.label }]
            : visit.history;
        stack.push({
          node: edge.next,
          parts: [...visit.parts, edgeKey, i, 'next'],
          labels: [...visit.labels, edge.label],
          history,
        });
      }
    }
  }

  private checkNode(visit: Visit) {
    const { node, parts } = visit;
    const firstPath = this.seenIds.get(node.id);
    if (firstPath !== undefined) {
      this.add('duplicate-id', [...parts, 'id'], `node id "${node.id}" is already used at ${firstPath}`, visit);
    } else {
      this.seenIds.set(node.id, whereInTree(visit.labels).replace(/^at /, ''));
    }
    if (node.kind === 'decision') this.checkDecision(node, visit);
    else if (node.kind === 'chance') this.checkChance(visit);
    else this.checkTerminal(visit);
  }

  private checkDecision(node: DecisionNode, visit: Visit) {
    if (!this.teamIds.has(node.team)) {
      this.add('unknown-team', [...visit.parts, 'team'], `the mover "${node.team}" is not one of the teams`, visit);
    }
    this.checkLabels(node.actions, [...visit.parts, 'actions'], 'action', visit);
    node.actions.forEach((action, i) => this.checkRung(action.rung, [...visit.parts, 'actions', i, 'rung'], visit));
    if (node.infoset !== undefined) {
      const entry = this.infosets.get(node.infoset);
      if (entry) entry.members.push(visit);
      else this.infosets.set(node.infoset, { first: visit, members: [visit] });
    }
  }

  private checkRung(rung: number | undefined, parts: PathPart[], visit: Visit) {
    const count = this.game.rungs?.length ?? 0;
    if (rung !== undefined && rung >= count) {
      this.add('unknown-rung', parts, `rung ${rung} does not exist (the game has ${count} rungs)`, visit);
    }
  }

  private checkLabels(edges: { label: string }[], parts: PathPart[], what: string, visit: Visit) {
    const seen = new Set<string>();
    edges.forEach((edge, i) => {
      if (seen.has(edge.label)) this.add('duplicate-label', [...parts, i, 'label'], `${what} label "${edge.label}" appears twice`, visit);
      seen.add(edge.label);
    });
  }

  private checkChance(visit: Visit) {
    const node = visit.node;
    if (node.kind !== 'chance') return;
    this.checkLabels(node.outcomes, [...visit.parts, 'outcomes'], 'outcome', visit);
    let exactSum = new Fraction(0);
    let floatSum = 0;
    node.outcomes.forEach((outcome, i) => {
      const p = parseExact(outcome.p)!;
      if (p.compare(0) < 0 || p.compare(1) > 0) {
        this.add('probability-range', [...visit.parts, 'outcomes', i, 'p'], `probability of "${outcome.label}" is ${p.toFraction()}, outside 0..1`, visit);
      }
      this.checkRung(outcome.rung, [...visit.parts, 'outcomes', i, 'rung'], visit);
      exactSum = exactSum.add(p);
      floatSum += p.valueOf();
    });
    if (!exactSum.equals(1) && Math.abs(floatSum - 1) > 1e-9) {
      this.add('probability-sum', [...visit.parts, 'outcomes'], `probabilities sum to ${exactSum.toFraction()}, not 1`, visit);
    }
  }

  private checkTerminal(visit: Visit) {
    const node = visit.node;
    if (node.kind !== 'terminal') return;
    for (const teamId of Object.keys(node.payoffs ?? {})) {
      if (!this.teamIds.has(teamId)) {
        this.add('unknown-team', [...visit.parts, 'payoffs', teamId], `payoff for unknown team "${teamId}"`, visit);
      }
    }
    for (const key of Object.keys(node.attributes ?? {})) {
      if (this.attributeKeys && !this.attributeKeys.has(key)) {
        this.add('unknown-attribute', [...visit.parts, 'attributes', key], `unknown attribute "${key}"`, visit);
      }
    }
    for (const team of this.game.teams) {
      const scored = node.attributes !== undefined && this.game.weights?.[team.id] !== undefined;
      if (node.payoffs?.[team.id] === undefined && !scored) {
        this.add('payoff-missing', [...visit.parts, 'payoffs'], `no payoff for team "${team.id}" (give one, or attributes and weights)`, visit);
      }
    }
  }

  private checkInfosets() {
    for (const [id, { first, members }] of this.infosets) {
      const clash = this.seenIds.has(id) && !members.some((m) => m.node.id === id);
      if (clash) {
        this.add('infoset-id-clash', [...first.parts, 'infoset'], `information set id "${id}" is also the id of another node`, first);
      }
      if (members.length < 2) continue;
      const head = first.node as DecisionNode;
      const headLabels = head.actions.map((a) => a.label);
      const headRecall = this.recall(first, head.team);
      for (const member of members.slice(1)) {
        const node = member.node as DecisionNode;
        if (node.team !== head.team) {
          this.add('infoset-teams', [...member.parts, 'team'], `information set "${id}" spans teams "${head.team}" and "${node.team}"`, member);
          continue;
        }
        const labels = node.actions.map((a) => a.label);
        if (labels.join('\u0000') !== headLabels.join('\u0000')) {
          this.add(
            'infoset-actions',
            [...member.parts, 'actions'],
            `information set "${id}" offers [${labels.join(', ')}] here but [${headLabels.join(', ')}] ${whereInTree(first.labels)}; members must offer the same actions in the same order`,
            member,
          );
          continue;
        }
        if (this.recall(member, head.team) !== headRecall) {
          this.add(
            'perfect-recall',
            [...member.parts, 'infoset'],
            `perfect recall is broken: team "${head.team}" reaches information set "${id}" here after different moves of its own than ${whereInTree(first.labels)}`,
            member,
          );
        }
      }
    }
  }

  /** What the team itself did before reaching this node: its information sets and choices. */
  private recall(visit: Visit, team: string): string {
    return visit.history
      .filter((h) => h.team === team)
      .map((h) => `${h.key}\u0001${h.label}`)
      .join('\u0000');
  }
}
