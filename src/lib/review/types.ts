/** What Review computes for one exercise: plain data, ready for JSON, charts, CSV and the report. */
import type { InjectRecord, ObserverNote, PlayedMoveKind } from '../exercise/record';
import type { ExerciseState } from '../roles';
import type { EquilibriumCounts } from './engine';

export type RungRef = { index: number; key: string; name: string; intensity: number };

export type TeamRef = { id: string; name: string };

/** Where a line of play ends (or stands): the node, its outcome text and the authored payoffs. */
export type EndPoint = {
  nodeId: string;
  terminal: boolean;
  outcome: string | null;
  /** Labels from the root. */
  path: string[];
  /** Authored payoff of every team at the terminal, in team order; empty while play is under way. */
  payoffs: number[];
  rung: RungRef | null;
};

export type MoveReview = {
  moveId: string;
  /** 1-based position in the order of play. */
  step: number;
  turn: number;
  nodeId: string;
  teamId: string | null;
  /** The team's name, or "Chance" at a chance node. */
  mover: string;
  label: string;
  kind: PlayedMoveKind;
  /** The subgame-perfect action at this node; null at chance nodes. */
  equilibriumAction: string | null;
  deviated: boolean;
  /** Mover's continuation value of the equilibrium action minus that of the move made, equilibrium play after. */
  regret: number | null;
  valueOfMove: number | null;
  valueOfEquilibrium: number | null;
  /** Probability the logit QRE at the teams' fitted lambdas gives the move made. */
  qreProbability: number | null;
  /** The rung the crisis stood at after the move, and after the equilibrium action. */
  rung: RungRef | null;
  equilibriumRung: RungRef | null;
  rationale: string | null;
  confidence: number | null;
  proposal: string | null;
  reason: string | null;
  submittedByName: string | null;
  at: string;
};

export type TeamFit = {
  teamId: string;
  team: string;
  /** Ladder moves the fit uses (adjudicated moves and chance draws are left out). */
  moves: number;
  deviations: number;
  totalRegret: number;
  /** Maximum-likelihood logit lambda for this team's moves; null without moves to fit. */
  lambda: number | null;
  /** 'upper': at the top of the range searched, read lambda as "at least"; 'lower': 0, random play fits best; null inside the range or without moves. */
  lambdaBound: 'lower' | 'upper' | null;
  logLikelihood: {
    /** At the fitted lambda. */
    qre: number | null;
    /** Every available action equally likely. */
    uniform: number;
    /** Equilibrium play with probability 1 - tremble, else an action uniformly at random. */
    trembles: number;
  };
};

/**
 * The escalation level at the end of one turn. A turn is one stage of play: a
 * move made without seeing the one before it (a simultaneous stage) shares that
 * move's turn; every other move or chance draw starts a new one.
 */
export type LevelPoint = {
  turn: number;
  /** Intensity of the rung after this turn of actual play; null past its end. */
  actual: number | null;
  equilibrium: number | null;
  actualRung: string | null;
  equilibriumRung: string | null;
};

export type RegretPoint = { step: number; turn: number; teamId: string; team: string; label: string; regret: number };

export type Counterfactual = {
  moveId: string;
  step: number;
  turn: number;
  team: string;
  label: string;
  equilibriumAction: string;
  /** Everyone follows the equilibrium from the deviation's node: the deviation does not happen. */
  instead: EndPoint;
  /** The deviation happens, then everyone follows the equilibrium. */
  after: EndPoint;
};

/** Play ended by the facilitator at an outcome, instead of by a move of the tree. */
export type EndingReview = {
  moveId: string;
  turn: number;
  /** The team whose proposal was adjudicated, or null. */
  mover: string | null;
  outcome: string;
  proposal: string | null;
  reason: string | null;
  at: string;
  /** Where equilibrium play from the point where play was ended would have gone. */
  equilibriumFromThere: EndPoint;
};

export type EdgeUse = { actual: boolean; equilibrium: boolean; counterfactual: boolean };

/** The part of the tree the review draws: every node on the actual, equilibrium and counterfactual lines. */
export type PathTree = {
  nodes: { id: string; kind: 'decision' | 'chance' | 'terminal'; label: string; outcome: string | null; payoffs: number[] }[];
  edges: ({ from: string; to: string; label: string } & EdgeUse)[];
};

export type TimelineEntry =
  | { kind: 'move'; at: string; turn: number; move: MoveReview }
  | { kind: 'note'; at: string; turn: number | null; note: ObserverNote }
  | { kind: 'inject'; at: string; turn: number | null; inject: InjectRecord }
  | { kind: 'ending'; at: string; turn: number; ending: EndingReview };

export type Review = {
  exerciseId: string;
  title: string;
  state: ExerciseState;
  teams: TeamRef[];
  /** How the equilibrium was solved, how many plays and strategy profiles it has, and where its path ends. */
  equilibrium: EquilibriumCounts & { method: string; end: EndPoint };
  actual: EndPoint;
  /** Set when the facilitator ended play at an outcome by adjudication. */
  ending: EndingReview | null;
  moves: MoveReview[];
  fits: TeamFit[];
  /** The fitted lambda of every team (0 for a team without moves), at which move probabilities are given. */
  lambdas: Record<string, number>;
  /** The lambda fit: the top of the range it searched, and whether its ascent met its tolerances. */
  lambdaFit: { maxLambda: number; converged: boolean };
  tremble: number;
  escalation: LevelPoint[];
  regret: RegretPoint[];
  counterfactuals: Counterfactual[];
  tree: PathTree;
  timeline: TimelineEntry[];
  /** Rungs of the ladder, lowest first, for chart axes. */
  rungs: RungRef[];
};
