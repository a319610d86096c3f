/**
 * The game model: teams, nodes (decision, chance, terminal), outcome attributes and the
 * weights through which each team scores them. Plain JSON data; every node has an id
 * that is unique in the tree. The zod schemas check shape; validate.ts checks meaning.
 */
import { z } from 'zod';
import { EXACT_PATTERN, type Num } from './numbers';

export type { Num };

export const MIN_TEAMS = 2;
export const MAX_TEAMS = 6;
/** Default ceiling on the number of nodes a model tree may have. */
export const DEFAULT_MAX_NODES = 100_000;

const NUM_MESSAGE = 'must be a finite number or an exact value such as "1/3" or "0.25"';

export const NumSchema = z
  .union([z.number(), z.string().regex(EXACT_PATTERN)], { error: NUM_MESSAGE })
  .meta({ id: 'Num', description: 'A finite number, or an exact value such as "1/3", "-2" or "0.25".' });

const IdSchema = z
  .string({ error: 'must be a text id' })
  .min(1, { error: 'must not be empty' })
  .max(200, { error: 'must be at most 200 characters' });

export type MoveKind = 'climb' | 'hold' | 'step-down' | 'settle' | 'third-party';

export interface Action {
  label: string;
  /** What the ladder builder made this action: a climb, a hold, a step down, a settlement, a third party's move. */
  move?: MoveKind;
  /** Index into game.rungs of the rung the crisis stands at after this action. */
  rung?: number;
  next: GameNode;
}

export interface ChanceOutcome {
  label: string;
  p: Num;
  rung?: number;
  next: GameNode;
}

export interface DecisionNode {
  id: string;
  kind: 'decision';
  team: string;
  /** Nodes sharing an infoset id cannot be told apart by the team that moves there. */
  infoset?: string;
  actions: Action[];
}

export interface ChanceNode {
  id: string;
  kind: 'chance';
  outcomes: ChanceOutcome[];
}

export interface TerminalNode {
  id: string;
  kind: 'terminal';
  /** A short description of how the crisis ended here. */
  outcome?: string;
  /** Payoff per team id. When absent, each team scores `attributes` through its weights. */
  payoffs?: Record<string, Num>;
  attributes?: Record<string, Num>;
}

export type GameNode = DecisionNode | ChanceNode | TerminalNode;

export interface Team {
  id: string;
  name: string;
}

export type Direction = 'more-is-better' | 'less-is-better';

export interface Attribute {
  key: string;
  label: string;
  unit?: string;
  direction: Direction;
}

export interface Rung {
  key: string;
  name: string;
  intensity: number;
  description: string;
  attributes?: Record<string, Num>;
}

export interface Game {
  teams: Team[];
  attributes?: Attribute[];
  /** weights[teamId][attributeKey] */
  weights?: Record<string, Record<string, Num>>;
  rungs?: Rung[];
  root: GameNode;
}

const LabelSchema = z
  .string({ error: 'must be a text label' })
  .regex(/\S/, { error: 'must not be blank' })
  .max(200, { error: 'must be at most 200 characters' });

const MoveKindSchema = z.enum(['climb', 'hold', 'step-down', 'settle', 'third-party']);
const RungIndexSchema = z.number().int().min(0);

export const ActionSchema = z.object({
  label: LabelSchema,
  move: MoveKindSchema.optional(),
  rung: RungIndexSchema.optional(),
  get next(): z.ZodType<GameNode> {
    return GameNodeSchema;
  },
});

export const ChanceOutcomeSchema = z.object({
  label: LabelSchema,
  p: NumSchema,
  rung: RungIndexSchema.optional(),
  get next(): z.ZodType<GameNode> {
    return GameNodeSchema;
  },
});

export const DecisionNodeSchema = z.object({
  id: IdSchema,
  kind: z.literal('decision'),
  team: IdSchema,
  infoset: IdSchema.optional(),
  actions: z.array(ActionSchema).min(1, { error: 'a decision node needs at least one action' }),
});

export const ChanceNodeSchema = z.object({
  id: IdSchema,
  kind: z.literal('chance'),
  outcomes: z.array(ChanceOutcomeSchema).min(1, { error: 'a chance node needs at least one outcome' }),
});

export const TerminalNodeSchema = z.object({
  id: IdSchema,
  kind: z.literal('terminal'),
  outcome: z.string().max(500).optional(),
  payoffs: z.record(IdSchema, NumSchema).optional(),
  attributes: z.record(IdSchema, NumSchema).optional(),
});

export const GameNodeSchema: z.ZodType<GameNode> = z
  .discriminatedUnion('kind', [DecisionNodeSchema, ChanceNodeSchema, TerminalNodeSchema], {
    error: 'must be a node with kind "decision", "chance" or "terminal"',
  })
  .meta({ id: 'Node' });

export const TeamSchema = z.object({ id: IdSchema, name: LabelSchema });

export const AttributeSchema = z.object({
  key: IdSchema,
  label: LabelSchema,
  unit: z.string().max(60).optional(),
  direction: z.enum(['more-is-better', 'less-is-better']),
});

export const RungSchema = z.object({
  key: IdSchema,
  name: LabelSchema,
  intensity: z.number(),
  description: z.string().max(4000),
  attributes: z.record(IdSchema, NumSchema).optional(),
});

export const WeightsSchema = z.record(IdSchema, z.record(IdSchema, NumSchema));

export const GameSchema = z.object({
  teams: z
    .array(TeamSchema)
    .min(MIN_TEAMS, { error: `a game needs ${MIN_TEAMS} to ${MAX_TEAMS} teams` })
    .max(MAX_TEAMS, { error: `a game needs ${MIN_TEAMS} to ${MAX_TEAMS} teams` }),
  attributes: z.array(AttributeSchema).optional(),
  weights: WeightsSchema.optional(),
  rungs: z.array(RungSchema).optional(),
  root: GameNodeSchema,
});

/** Children of a node with the label of the edge leading to each. */
export function childEdges(node: GameNode): { label: string; next: GameNode }[] {
  if (node.kind === 'decision') return node.actions;
  if (node.kind === 'chance') return node.outcomes;
  return [];
}
