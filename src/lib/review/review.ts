/**
 * Review of one exercise: the play actually made beside the subgame-perfect
 * play, move by move and team by team. Pure: a game and a play record in, plain
 * data out. Everything follows from the authored payoffs.
 */
import type { AdjudicatedEnding, PlayedMove, PlayRecord } from '../exercise/record';
import {
  actionValues,
  choiceKey,
  equilibriumCounts,
  indexGame,
  nodeById,
  payoffScorer,
  solveSubgamePerfect,
  type Equilibrium,
  type Game,
  type GameNode,
  type LogitFit,
  type SubgamePerfectResult,
} from './engine';
import { fitTeams, type Observation } from './likelihood';
import { drawsOf, followProfile, playedLine, PlayMismatch, type Choices, type Draws, type Line } from './paths';
import type {
  Counterfactual,
  EndingReview,
  EndPoint,
  LevelPoint,
  MoveReview,
  PathTree,
  RegretPoint,
  Review,
  RungRef,
  TimelineEntry,
} from './types';

/** Probability of a random action in the "equilibrium with trembles" benchmark (common practice, no single source). */
export const DEFAULT_TREMBLE = 0.01;

export type ReviewOptions = {
  tremble?: number;
  /** The engine's heavy results, when they were computed elsewhere (the solver pool): the equilibria of the game and the fit of the record's ladder moves. */
  solved?: SubgamePerfectResult;
  fit?: LogitFit;
};

type Context = {
  game: Game;
  teamIndex: Map<string, number>;
  teamName: Map<string, string>;
  score: (node: GameNode) => number[];
  rungs: RungRef[];
};

function contextOf(game: Game): Context {
  const scorer = payoffScorer(game);
  return {
    game,
    teamIndex: new Map(game.teams.map((t, i) => [t.id, i])),
    teamName: new Map(game.teams.map((t) => [t.id, t.name])),
    score: (node) => (node.kind === 'terminal' ? scorer(node).map((f) => f.valueOf()) : []),
    rungs: (game.rungs ?? []).map((r, index) => ({ index, key: r.key, name: r.name, intensity: r.intensity })),
  };
}

export function reviewPlay(game: Game, record: PlayRecord, options: ReviewOptions = {}): Review {
  const tremble = options.tremble ?? DEFAULT_TREMBLE;
  const ctx = contextOf(game);
  const solved = options.solved ?? solveSubgamePerfect(game);
  const equilibrium = solved.equilibria[0]!;
  const played = playedLine(game, record.moves);
  const draws = drawsOf(record.moves);
  const { fits, lambdas, qre, fit } = fitTeams(game, observationsOf(record.moves), equilibrium, tremble, options.fit);
  const moves = record.moves.map((move, i) => reviewMove(ctx, equilibrium, qre, move, i + 1, played.nodes[i]!));
  for (const fit of fits) {
    const own = moves.filter((m) => m.teamId === fit.teamId);
    fit.deviations = own.filter((m) => m.deviated).length;
    fit.totalRegret = own.reduce((sum, m) => sum + (m.regret ?? 0), 0);
  }
  const equilibriumLine = followProfile(game.root, equilibrium.choices, draws);
  const deviations = counterfactualsOf(ctx, equilibrium.choices, draws, played, moves);
  const ended = record.ending ? endingOf(ctx, record.ending, played, equilibrium.choices, draws) : null;
  return {
    exerciseId: record.exerciseId,
    title: record.title,
    state: record.state,
    teams: game.teams.map((t) => ({ id: t.id, name: t.name })),
    equilibrium: { method: solved.method, ...equilibriumCounts(solved), end: endPoint(ctx, equilibriumLine) },
    actual: ended?.actual ?? endPoint(ctx, played),
    ending: ended?.review ?? null,
    moves,
    fits,
    lambdas,
    lambdaFit: { maxLambda: fit.maxLambda, converged: fit.converged },
    tremble,
    escalation: escalationSeries(ctx, played, equilibriumLine),
    regret: regretSeries(moves),
    counterfactuals: deviations.map((d) => d.counterfactual),
    tree: pathTree(ctx, ended?.line ?? played, equilibriumLine, [...deviations.flatMap((d) => d.lines), ...(ended ? [ended.instead] : [])]),
    timeline: timelineOf(record, moves, ended?.review ?? null),
    rungs: ctx.rungs,
  };
}

/** The ladder moves teams chose themselves; adjudicated moves and chance draws are not their choices. */
export function observationsOf(moves: PlayedMove[]): Observation[] {
  return moves.filter((m) => m.kind === 'ladder' && m.teamId).map((m) => ({ teamId: m.teamId!, nodeId: m.nodeId, label: m.label }));
}

function edgeRung(node: GameNode, label: string): number | undefined {
  if (node.kind === 'decision') return node.actions.find((a) => a.label === label)?.rung;
  if (node.kind === 'chance') return node.outcomes.find((o) => o.label === label)?.rung;
  return undefined;
}

function rungRef(ctx: Context, index: number | undefined): RungRef | null {
  return index === undefined ? null : (ctx.rungs[index] ?? null);
}

/** The rung after each edge of a line, carried forward over edges that do not set one. */
function rungsAlong(ctx: Context, line: Line): (RungRef | null)[] {
  let current: RungRef | null = null;
  return line.labels.map((label, k) => {
    current = rungRef(ctx, edgeRung(line.nodes[k]!, label)) ?? current;
    return current;
  });
}

function endPoint(ctx: Context, line: Line): EndPoint {
  const node = line.nodes[line.nodes.length - 1]!;
  return {
    nodeId: node.id,
    terminal: node.kind === 'terminal',
    outcome: node.kind === 'terminal' ? (node.outcome ?? null) : null,
    path: line.labels,
    payoffs: ctx.score(node),
    rung: rungsAlong(ctx, line).at(-1) ?? null,
  };
}

function reviewMove(ctx: Context, eq: Equilibrium, qre: Choices, move: PlayedMove, step: number, node: GameNode): MoveReview {
  const base = {
    moveId: move.id,
    step,
    turn: move.turn,
    nodeId: move.nodeId,
    teamId: move.teamId,
    label: move.label,
    kind: move.kind,
    rung: rungRef(ctx, edgeRung(node, move.label)),
    rationale: move.rationale,
    confidence: move.confidence,
    proposal: move.proposal,
    reason: move.reason,
    submittedByName: move.submittedByName,
    at: move.at,
  };
  if (node.kind !== 'decision') {
    return { ...base, mover: 'Chance', equilibriumAction: null, deviated: false, regret: null, valueOfMove: null, valueOfEquilibrium: null, qreProbability: null, equilibriumRung: null };
  }
  const values = actionValues(ctx.game, eq, node.id);
  const team = ctx.teamIndex.get(node.team)!;
  const valueOf = (label: string) => values.actions.find((a) => a.label === label)!.values[team]!;
  const valueOfMove = valueOf(move.label);
  const valueOfEquilibrium = valueOf(values.equilibriumAction);
  return {
    ...base,
    mover: ctx.teamName.get(node.team) ?? node.team,
    equilibriumAction: values.equilibriumAction,
    deviated: move.label !== values.equilibriumAction,
    regret: valueOfEquilibrium - valueOfMove,
    valueOfMove,
    valueOfEquilibrium,
    qreProbability: qre[choiceKey(node)]?.[move.label] ?? null,
    equilibriumRung: rungRef(ctx, edgeRung(node, values.equilibriumAction)),
  };
}

/** The turn of each edge of a line: a node in an information set of several nodes moves without seeing the edge before, in the same turn. */
function turnsAlong(ctx: Context, line: Line): number[] {
  const infosets = indexGame(ctx.game).infosets;
  let turn = 0;
  return line.labels.map((_, k) => {
    const node = line.nodes[k]!;
    const unseen = k > 0 && node.kind === 'decision' && node.infoset !== undefined && (infosets.get(node.infoset)?.length ?? 0) > 1;
    if (!unseen) turn++;
    return turn;
  });
}

/** The rung at the end of every turn of a line (index turn - 1). */
function levelsByTurn(ctx: Context, line: Line): (RungRef | null)[] {
  const turns = turnsAlong(ctx, line);
  const rungs = rungsAlong(ctx, line);
  const levels: (RungRef | null)[] = [];
  turns.forEach((turn, k) => (levels[turn - 1] = rungs[k] ?? null));
  return levels;
}

function escalationSeries(ctx: Context, played: Line, equilibrium: Line): LevelPoint[] {
  const actual = levelsByTurn(ctx, played);
  const rational = levelsByTurn(ctx, equilibrium);
  return Array.from({ length: Math.max(actual.length, rational.length) }, (_, k) => ({
    turn: k + 1,
    actual: actual[k]?.intensity ?? null,
    equilibrium: rational[k]?.intensity ?? null,
    actualRung: actual[k]?.name ?? null,
    equilibriumRung: rational[k]?.name ?? null,
  }));
}

function regretSeries(moves: MoveReview[]): RegretPoint[] {
  return moves
    .filter((m) => m.regret !== null && m.teamId !== null)
    .map((m) => ({ step: m.step, turn: m.turn, teamId: m.teamId!, team: m.mover, label: m.label, regret: m.regret! }));
}

/** A line from the root to `prefix` followed by `rest`, which starts at the prefix's last node. */
function join(prefix: Line, upTo: number, rest: Line): Line {
  return { nodes: [...prefix.nodes.slice(0, upTo), ...rest.nodes], labels: [...prefix.labels.slice(0, upTo), ...rest.labels] };
}

type Deviation = { counterfactual: Counterfactual; lines: Line[] };

function counterfactualsOf(ctx: Context, choices: Choices, draws: Draws, played: Line, moves: MoveReview[]): Deviation[] {
  return moves
    .filter((m) => m.deviated)
    .map((m) => {
      const at = m.step - 1;
      const instead = join(played, at, followProfile(played.nodes[at]!, choices, draws));
      const after = join(played, at + 1, followProfile(played.nodes[at + 1]!, choices, draws));
      const counterfactual: Counterfactual = {
        moveId: m.moveId,
        step: m.step,
        turn: m.turn,
        team: m.mover,
        label: m.label,
        equilibriumAction: m.equilibriumAction!,
        instead: endPoint(ctx, instead),
        after: endPoint(ctx, after),
      };
      return { counterfactual, lines: [instead, after] };
    });
}

function pathTree(ctx: Context, played: Line, equilibrium: Line, counterfactual: Line[]): PathTree {
  const nodes = new Map<string, PathTree['nodes'][number]>();
  const edges = new Map<string, PathTree['edges'][number]>();
  const add = (line: Line, use: 'actual' | 'equilibrium' | 'counterfactual') => {
    line.nodes.forEach((node, k) => {
      if (!nodes.has(node.id)) {
        const label = node.kind === 'decision' ? (ctx.teamName.get(node.team) ?? node.team) : node.kind === 'chance' ? 'Chance' : (node.outcome ?? 'End');
        nodes.set(node.id, { id: node.id, kind: node.kind, label, outcome: node.kind === 'terminal' ? (node.outcome ?? null) : null, payoffs: ctx.score(node) });
      }
      if (k === 0) return;
      const from = line.nodes[k - 1]!.id;
      const key = `${from}\u0000${node.id}`;
      const edge = edges.get(key) ?? { from, to: node.id, label: line.labels[k - 1]!, actual: false, equilibrium: false, counterfactual: false };
      edge[use] = true;
      edges.set(key, edge);
    });
  };
  add(played, 'actual');
  add(equilibrium, 'equilibrium');
  for (const line of counterfactual) add(line, 'counterfactual');
  return { nodes: [...nodes.values()], edges: [...edges.values()] };
}

/** The facilitator's ending: where it left play, the line drawn to its outcome, and where equilibrium play would have gone instead. */
function endingOf(ctx: Context, ending: AdjudicatedEnding, played: Line, choices: Choices, draws: Draws) {
  const here = played.nodes[played.nodes.length - 1]!;
  if (ending.nodeId !== here.id) throw new PlayMismatch(`The adjudicated ending ${ending.moveId} was made at node "${ending.nodeId}", but play stood at "${here.id}"`);
  const terminal = nodeById(ctx.game, ending.outcomeNodeId);
  if (terminal?.kind !== 'terminal') throw new PlayMismatch(`The adjudicated ending ${ending.moveId} names "${ending.outcomeNodeId}", which is not an outcome of the scenario tree`);
  const line: Line = { nodes: [...played.nodes, terminal], labels: [...played.labels, ADJUDICATED_ENDING] };
  const instead = join(played, played.nodes.length - 1, followProfile(here, choices, draws));
  const actual: EndPoint = { ...endPoint(ctx, played), nodeId: terminal.id, terminal: true, outcome: ending.outcome, payoffs: ctx.score(terminal) };
  const review: EndingReview = {
    moveId: ending.moveId,
    turn: ending.turn,
    mover: ending.teamId ? (ctx.teamName.get(ending.teamId) ?? ending.teamId) : null,
    outcome: ending.outcome,
    proposal: ending.proposal,
    reason: ending.reason,
    at: ending.at,
    equilibriumFromThere: endPoint(ctx, instead),
  };
  return { actual, review, line, instead };
}

/** The label of the drawn edge from where play stood to the outcome the facilitator chose. */
export const ADJUDICATED_ENDING = 'Ended by adjudication';

function timelineOf(record: PlayRecord, moves: MoveReview[], ending: EndingReview | null): TimelineEntry[] {
  const entries: TimelineEntry[] = [
    ...moves.map((move): TimelineEntry => ({ kind: 'move', at: move.at, turn: move.turn, move })),
    ...(ending ? [{ kind: 'ending', at: ending.at, turn: ending.turn, ending } as TimelineEntry] : []),
    ...record.notes.map((note): TimelineEntry => ({ kind: 'note', at: note.at, turn: note.turn, note })),
    ...record.injects.map((inject): TimelineEntry => ({ kind: 'inject', at: inject.at, turn: inject.turn, inject })),
  ];
  return entries.sort((a, b) => a.at.localeCompare(b.at));
}
