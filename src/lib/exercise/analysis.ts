/**
 * The equilibrium recommendation and the logit QRE forecast at the node play
 * stands at. Both are solved once per frozen scenario version (and lambda) over
 * the whole tree and kept in memory; a version too large to solve during play
 * says so and points to Review, so live play never waits on a long solve.
 */
import { childEdges, type Game, type GameNode } from '../engine/model';
import { toFloat } from '../engine/numbers';
import { actionValues, type Equilibrium } from '../engine/profile';
import { payoffScorer } from '../engine/scoring';
import { logitQre, type QreResult } from '../engine/solvers/qre';
import { solveSubgamePerfect } from '../engine/solvers/subgame-perfect';
import { indexGame } from '../engine/tree';
import { shared } from '../runtime';
import { isMoving, nodeAt, type Stage } from './play';
import type { ScenarioInfo } from './scenario-info';
import { ANALYSIS_CAUTION, type AnalysisView, type EquilibriumAdvice, type ForecastView } from './view';

/** Trees above this size are analysed in Review (the worker pool), not during play. */
export const LIVE_ANALYSIS_MAX_NODES = 20_000;

type Solved = { equilibrium: Equilibrium | null; equilibriumNote: string | null; qre: QreResult | null };

const cache = () => shared('exercise.analysis-cache', () => new Map<string, Solved | { failed: string }>());

function solve(scenario: ScenarioInfo, lambda: number): Solved | { failed: string } {
  const key = `${scenario.versionId}:${lambda}`;
  const known = cache().get(key);
  if (known) return known;
  let solved: Solved | { failed: string };
  if (indexGame(scenario.game).nodes.length > LIVE_ANALYSIS_MAX_NODES) {
    solved = { failed: `This tree has more than ${LIVE_ANALYSIS_MAX_NODES.toLocaleString('en-GB')} nodes; see Review for its analysis.` };
  } else {
    solved = solveBoth(scenario.game, lambda);
  }
  cache().set(key, solved);
  return solved;
}

function solveBoth(game: Game, lambda: number): Solved {
  let equilibrium: Equilibrium | null = null;
  let equilibriumNote: string | null = null;
  try {
    const result = solveSubgamePerfect(game);
    equilibrium = result.equilibria[0] ?? null;
    if (result.count > 1) equilibriumNote = `One of ${result.countExact ? '' : 'at least '}${result.count} subgame-perfect equilibria (ties or mixed play); others may differ.`;
  } catch (error) {
    equilibriumNote = `No equilibrium could be computed: ${error instanceof Error ? error.message : String(error)}`;
  }
  let qre: QreResult | null = null;
  try {
    qre = logitQre(game, { lambda });
  } catch {
    qre = null;
  }
  return { equilibrium, equilibriumNote, qre };
}

const likeliest = (probabilities: Record<string, number>): string =>
  Object.entries(probabilities).reduce((best, entry) => (entry[1] > best[1] ? entry : best))[0];

/** Follow the equilibrium from a node to a terminal, taking each chance node's likeliest outcome. */
function followEquilibrium(game: Game, from: GameNode, eq: Equilibrium): GameNode {
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

function advice(game: Game, stage: Extract<Stage, { movers: unknown }>, eq: Equilibrium, note: string | null): EquilibriumAdvice {
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
  const end = followEquilibrium(game, nodeAt(game, stage.nodeId), eq);
  const payoffs = end.kind === 'terminal' ? payoffScorer(game)(end) : null;
  return {
    actions,
    outcome: end.kind === 'terminal' ? (end.outcome ?? end.id) : null,
    payoffs: payoffs ? Object.fromEntries(game.teams.map((team, i) => [team.id, payoffs[i]!.valueOf().toFixed(2)])) : null,
    note,
  };
}

function forecast(stage: Extract<Stage, { movers: unknown }>, qre: QreResult, lambda: number): ForecastView {
  return { lambda, teams: stage.movers.map((m) => ({ teamId: m.team, probabilities: qre.behaviour[m.key] ?? {} })) };
}

export function analysisAt(scenario: ScenarioInfo, stage: Stage, lambda: number): AnalysisView {
  const base = { nodeId: stage.nodeId, caution: ANALYSIS_CAUTION };
  if (!isMoving(stage)) return { ...base, status: 'ready', equilibrium: null, forecast: null };
  const solved = solve(scenario, lambda);
  if ('failed' in solved) return { ...base, status: 'unavailable', message: solved.failed };
  return {
    ...base,
    status: 'ready',
    equilibrium: solved.equilibrium ? advice(scenario.game, stage, solved.equilibrium, solved.equilibriumNote) : null,
    forecast: solved.qre ? forecast(stage, solved.qre, lambda) : null,
  };
}
