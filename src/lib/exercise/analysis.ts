/**
 * The equilibrium recommendation and the logit QRE forecast at the node play
 * stands at. Both are solved once per frozen scenario version (and lambda) over
 * the whole tree, in the solver worker pool when the server registered a runner
 * (so live play never waits on a solve), and kept in memory. Until a solve is
 * done the section says "computing"; the hub sends the result when it is in.
 */
import {
  childEdges,
  type Game,
  type GameNode,
  toFloat,
  actionValues,
  type Equilibrium,
  payoffScorer,
  logitQre,
  type QreResult,
  solveSubgamePerfect,
  type SubgamePerfectResult,
  equilibriumCountPhrase,
  equilibriumCounts,
  hasSeveralPlays,
  reachesNode,
  type EquilibriumCounts,
} from '../engine';
import { lookup, shared } from '../runtime';
import { isMoving, nodeAt, type Stage } from './play';
import type { ScenarioInfo } from './scenario-info';
import { ANALYSIS_CAUTION, type AnalysisView, type EquilibriumAdvice, type ForecastView } from './view';

export type Solved = { equilibrium: Equilibrium | null; counts: EquilibriumCounts; qre: QreResult | null };
/** A solved version, with the view of each node worked out once (every viewer may share it). */
type Entry = { status: 'computing' } | { status: 'failed'; message: string } | ({ status: 'ready'; views?: Map<string, AnalysisView> } & Solved);

/** Runs both solves off the main thread; registered by the server (server/live/analysis.ts). */
export type AnalysisRunner = (game: Game, lambda: number) => Promise<{ equilibria: SubgamePerfectResult; qre: QreResult | null }>;
export const ANALYSIS_RUNNER = 'exercise.analysis-runner';
/** Told when a version's analysis is in, so the hub can send it to the screens showing it. */
export const ANALYSIS_LISTENER = 'exercise.analysis-listener';

const cache = () => shared('exercise.analysis-cache', () => new Map<string, Entry>());

function entryFor(scenario: ScenarioInfo, lambda: number): Entry {
  const key = `${scenario.versionId}:${lambda}`;
  const known = cache().get(key);
  if (known) return known;
  const runner = lookup<AnalysisRunner>(ANALYSIS_RUNNER);
  if (!runner) {
    const solved = readSolved(solveSubgamePerfect(scenario.game), safeQre(scenario.game, lambda));
    cache().set(key, { status: 'ready', ...solved });
    return cache().get(key)!;
  }
  cache().set(key, { status: 'computing' });
  runner(scenario.game, lambda)
    .then(({ equilibria, qre }) => cache().set(key, { status: 'ready', ...readSolved(equilibria, qre) }))
    .catch((error: unknown) => cache().set(key, { status: 'failed', message: `The analysis could not be computed: ${error instanceof Error ? error.message : String(error)}` }))
    .finally(() => lookup<(versionId: string) => void>(ANALYSIS_LISTENER)?.(scenario.versionId));
  return cache().get(key)!;
}

function safeQre(game: Game, lambda: number): QreResult | null {
  try {
    return logitQre(game, { lambda });
  } catch {
    return null;
  }
}

function readSolved(result: SubgamePerfectResult, qre: QreResult | null): Solved {
  return { equilibrium: result.equilibria[0] ?? null, counts: equilibriumCounts(result), qre };
}

/**
 * What the advice at a node stands for. The counts are of the whole scenario; where play
 * has left the equilibrium path, ties among the profiles may allow other moves from here.
 */
export function equilibriumNote(counts: EquilibriumCounts, onPath: boolean): string | null {
  if (counts.count === 1 && counts.countExact) return null;
  const words = `From the start: ${equilibriumCountPhrase(counts)}`;
  const several = hasSeveralPlays(counts) ? '; the advice follows the first, others may differ' : '';
  const tiesOffPath = !counts.countExact || counts.count > counts.plays;
  const left = !onPath && tiesOffPath ? ' Play has left that path, where those profiles may differ: other moves from here may be just as rational.' : '';
  return `${words}${several}.${left}`;
}

const likeliest = (probabilities: Record<string, number>): string =>
  Object.entries(probabilities).reduce((best, entry) => (entry[1] > best[1] ? entry : best))[0];

/** Follow the equilibrium from a node to a terminal, taking each chance node's likeliest outcome. */
function followEquilibrium(from: GameNode, eq: Equilibrium): GameNode {
  let node = from;
  while (node.kind !== 'terminal') {
    const edges = childEdges(node);
    if (node.kind === 'decision') {
      const label = likeliest(eq.choices[node.infoset ?? node.id] ?? {});
      node = edges.find((e) => e.label === label)?.next ?? edges[0]!.next;
    } else {
      node = node.outcomes.reduce((best, o) => (toFloat(o.p) > toFloat(best.p) ? o : best)).next;
    }
  }
  return node;
}

function advice(game: Game, stage: Extract<Stage, { movers: unknown }>, eq: Equilibrium, counts: EquilibriumCounts): EquilibriumAdvice {
  const actions: EquilibriumAdvice['actions'] = [];
  let node = nodeAt(game, stage.nodeId);
  for (const mover of stage.movers) {
    if (node.kind !== 'decision') break;
    const values = actionValues(game, eq, node.id);
    const t = game.teams.findIndex((team) => team.id === mover.team);
    const chosen = values.actions.find((a) => a.label === values.equilibriumAction)!;
    const others = values.actions.filter((a) => a !== chosen).map((a) => a.values[t]!);
    const margin = others.length > 0 ? chosen.values[t]! - Math.max(...others) : null;
    actions.push({ teamId: mover.team, label: chosen.label, margin: margin === null ? null : margin.toFixed(2) });
    node = node.actions.find((a) => a.label === chosen.label)!.next;
  }
  const end = followEquilibrium(nodeAt(game, stage.nodeId), eq);
  const payoffs = end.kind === 'terminal' ? payoffScorer(game)(end) : null;
  return {
    actions,
    outcome: end.kind === 'terminal' ? (end.outcome ?? end.id) : null,
    payoffs: payoffs ? Object.fromEntries(game.teams.map((team, i) => [team.id, payoffs[i]!.valueOf().toFixed(2)])) : null,
    note: equilibriumNote(counts, reachesNode(game, eq, stage.nodeId)),
  };
}

function forecast(stage: Extract<Stage, { movers: unknown }>, qre: QreResult, lambda: number): ForecastView {
  return { lambda, teams: stage.movers.map((m) => ({ teamId: m.team, probabilities: qre.behaviour[m.key] ?? {} })) };
}

export function analysisAt(scenario: ScenarioInfo, stage: Stage, lambda: number): AnalysisView {
  const base = { nodeId: stage.nodeId, caution: ANALYSIS_CAUTION };
  if (!isMoving(stage)) return { ...base, status: 'ready', equilibrium: null, forecast: null };
  const entry = entryFor(scenario, lambda);
  if (entry.status === 'computing') return { ...base, status: 'computing', message: 'Solving the scenario in the background; the result appears here in a moment.' };
  if (entry.status === 'failed') return { ...base, status: 'unavailable', message: entry.message };
  const views = entry.views ?? (entry.views = new Map());
  const known = views.get(stage.nodeId);
  if (known) return known;
  const ready: AnalysisView = {
    ...base,
    status: 'ready',
    equilibrium: entry.equilibrium ? advice(scenario.game, stage, entry.equilibrium, entry.counts) : null,
    forecast: entry.qre ? forecast(stage, entry.qre, lambda) : null,
  };
  views.set(stage.nodeId, ready);
  return ready;
}
