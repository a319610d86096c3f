/**
 * The ladder builder: from an escalation ladder described in a facilitator's terms, the
 * game tree. The rules, in plain words:
 *
 * - Rungs are ordered from the calmest to the most severe. The crisis always stands on
 *   one rung; it starts on the `start` rung. Reaching the top rung ends the game at once
 *   (nothing is negotiated after open conflict).
 * - A round: each party (the teams in `parties`, in that order) makes one move, seeing
 *   the moves made before it in the round. Then the third party, if there is one and the
 *   crisis stands at or above its `fromRung`, makes one move. Then, after the round named
 *   in `chance`, if the crisis stands at or above the chance's `fromRung`, chance may
 *   shift the crisis (an incident at sea, a leak).
 * - The moves a party may make (as `moves` allows):
 *     climb up to k: move the crisis up 1, 2, ... or k rungs (never past the top);
 *     hold: leave it where it is;
 *     step down: move it down one rung (not below the bottom);
 *     settle: end the crisis where it stands by accepting a settlement; the settling
 *     team's `concessions` are added to the outcome.
 *   A team that steps down is seen to back down: its `stepDownCosts` (if any) are added
 *   each time it does.
 * - In the `simultaneousRound` the parties choose at the same time, without seeing each
 *   other's move: every party picks from the moves available at the round's starting
 *   rung, the climbs and step-downs add up, and if anyone settles the crisis ends at the
 *   starting rung with each settler's concessions.
 * - The third party's actions each shift the crisis by some rungs (`shift`, negative to
 *   calm it) and may end it (`ends`: e.g. a brokered settlement).
 * - After the last round the game ends where the crisis stands (a standoff).
 * - Outcome attributes of an ending: the attributes of the rung where it ends (e.g. who
 *   controls the strait), plus, for the attributes listed in `flows` (costs, casualties),
 *   the sum over rounds of the rung each round ended on, plus the one-off attributes of
 *   concessions, step-down costs, third-party actions and chance outcomes along the way.
 * - Each team scores an ending as the sum of weight x attribute over the attributes
 *   (an attribute whose direction is "less-is-better" counts with a minus sign).
 *
 * Node ids follow the path ("n.up1.hold.aside..."), so regenerating after an edit keeps
 * the ids of every node whose path still exists.
 */
import { z } from 'zod';
import { ROOT_ID, childId } from './ids';
import {
  DEFAULT_MAX_NODES,
  NumSchema,
  RungSchema,
  type Action,
  type ChanceOutcome,
  type GameNode,
  type MoveKind,
  type Rung,
  type Team,
} from './model';
import { Fraction, formatExact, toExact, type Num } from './numbers';
import { formatPath, type Fault } from './validate';

const KeySchema = z.string().regex(/^[a-z0-9][a-z0-9-]{0,31}$/, { error: 'must be 1-32 lower-case letters, digits or hyphens' });
const AttributeValues = z.record(z.string(), NumSchema);

export const LadderSpecSchema = z.object({
  rungs: z.array(RungSchema).min(2, { error: 'a ladder needs at least two rungs' }),
  start: z.number().int().min(0),
  rounds: z.number().int().min(1).max(8),
  parties: z.array(z.string()).min(1).max(6),
  moves: z.object({
    climbUpTo: z.number().int().min(1).max(8),
    hold: z.boolean(),
    stepDown: z.boolean(),
    settle: z.boolean(),
  }),
  simultaneousRound: z.number().int().min(1).nullable().optional(),
  thirdParty: z
    .object({
      team: z.string(),
      fromRung: z.number().int().min(0),
      actions: z
        .array(
          z.object({
            key: KeySchema,
            label: z.string().min(1).max(200),
            shift: z.number().int(),
            ends: z.boolean(),
            attributes: AttributeValues.optional(),
          }),
        )
        .min(1),
    })
    .optional(),
  chance: z
    .object({
      afterRound: z.number().int().min(1),
      /** Chance acts only when the crisis stands at or above this rung (default: always). */
      fromRung: z.number().int().min(0).optional(),
      label: z.string().min(1).max(200),
      outcomes: z
        .array(
          z.object({
            key: KeySchema,
            label: z.string().min(1).max(200),
            p: NumSchema,
            shift: z.number().int(),
            attributes: AttributeValues.optional(),
          }),
        )
        .min(1),
    })
    .optional(),
  flows: z.array(z.string()).optional(),
  concessions: z.record(z.string(), AttributeValues).optional(),
  stepDownCosts: z.record(z.string(), AttributeValues).optional(),
});

export type LadderSpec = z.infer<typeof LadderSpecSchema>;

type Totals = Map<string, Fraction>;

class TooLarge extends Error {}

export type BuiltLadder = { ok: true; root: GameNode; rungs: Rung[]; nodes: number } | { ok: false; faults: Fault[] };

/** Check the ladder against the teams and attribute keys; returns faults naming the spec path. */
export function checkLadder(spec: LadderSpec, teams: Team[], attributeKeys: string[], prefix = 'ladder'): Fault[] {
  const faults: Fault[] = [];
  const at = (parts: (string | number)[], message: string) => faults.push({ code: 'shape', path: formatPath([prefix, ...parts]), message });
  const teamIds = new Set(teams.map((t) => t.id));
  const attrs = new Set(attributeKeys);
  const top = spec.rungs.length - 1;
  const keys = new Set<string>();
  spec.rungs.forEach((r, i) => {
    if (keys.has(r.key)) at(['rungs', i, 'key'], `rung key "${r.key}" is used twice`);
    keys.add(r.key);
    for (const k of Object.keys(r.attributes ?? {})) if (!attrs.has(k)) at(['rungs', i, 'attributes', k], `unknown attribute "${k}"`);
  });
  if (spec.start >= top) at(['start'], `the crisis must start below the top rung (0..${top - 1})`);
  const parties = new Set<string>();
  spec.parties.forEach((p, i) => {
    if (!teamIds.has(p)) at(['parties', i], `unknown team "${p}"`);
    if (parties.has(p)) at(['parties', i], `team "${p}" is listed twice`);
    parties.add(p);
  });
  if (spec.simultaneousRound != null && spec.simultaneousRound > spec.rounds) at(['simultaneousRound'], `there are only ${spec.rounds} rounds`);
  if (spec.simultaneousRound != null && spec.parties.length < 2) at(['simultaneousRound'], 'a simultaneous round needs two or more parties');
  if (spec.thirdParty) {
    if (!teamIds.has(spec.thirdParty.team)) at(['thirdParty', 'team'], `unknown team "${spec.thirdParty.team}"`);
    if (parties.has(spec.thirdParty.team)) at(['thirdParty', 'team'], 'the third party cannot also be one of the parties');
    if (spec.thirdParty.fromRung > top) at(['thirdParty', 'fromRung'], `there is no rung ${spec.thirdParty.fromRung}`);
    uniqueKeys(spec.thirdParty.actions, ['thirdParty', 'actions'], at);
    spec.thirdParty.actions.forEach((a, i) => checkAttrs(a.attributes, ['thirdParty', 'actions', i, 'attributes'], attrs, at));
  }
  if (spec.chance) {
    if (spec.chance.afterRound > spec.rounds) at(['chance', 'afterRound'], `there are only ${spec.rounds} rounds`);
    if ((spec.chance.fromRung ?? 0) > top) at(['chance', 'fromRung'], `there is no rung ${spec.chance.fromRung}`);
    uniqueKeys(spec.chance.outcomes, ['chance', 'outcomes'], at);
    const sum = spec.chance.outcomes.reduce((s, o) => s.add(toExact(o.p)), new Fraction(0));
    if (!sum.equals(1)) at(['chance', 'outcomes'], `probabilities sum to ${formatExact(sum)}, not 1`);
    spec.chance.outcomes.forEach((o, i) => checkAttrs(o.attributes, ['chance', 'outcomes', i, 'attributes'], attrs, at));
  }
  (spec.flows ?? []).forEach((k, i) => {
    if (!attrs.has(k)) at(['flows', i], `unknown attribute "${k}"`);
  });
  for (const field of ['concessions', 'stepDownCosts'] as const) {
    for (const [team, values] of Object.entries(spec[field] ?? {})) {
      if (!parties.has(team)) at([field, team], `"${team}" is not one of the parties`);
      checkAttrs(values, [field, team], attrs, at);
    }
  }
  return faults;
}

function uniqueKeys(items: { key: string }[], parts: (string | number)[], at: (p: (string | number)[], m: string) => void) {
  const seen = new Set<string>();
  items.forEach((item, i) => {
    if (seen.has(item.key)) at([...parts, i, 'key'], `key "${item.key}" is used twice`);
    seen.add(item.key);
  });
}

function checkAttrs(values: Record<string, Num> | undefined, parts: (string | number)[], attrs: Set<string>, at: (p: (string | number)[], m: string) => void) {
  for (const k of Object.keys(values ?? {})) if (!attrs.has(k)) at([...parts, k], `unknown attribute "${k}"`);
}

/** Build the game tree of a ladder. Teams give the names used in outcome descriptions. */
export function buildLadder(spec: LadderSpec, teams: Team[], attributeKeys: string[], maxNodes = DEFAULT_MAX_NODES): BuiltLadder {
  const faults = checkLadder(spec, teams, attributeKeys);
  if (faults.length > 0) return { ok: false, faults };
  const builder = new Builder(spec, teams, maxNodes);
  try {
    const root = builder.round(1, spec.start, new Map(), ROOT_ID);
    return { ok: true, root, rungs: spec.rungs, nodes: builder.count };
  } catch (e) {
    if (!(e instanceof TooLarge)) throw e;
    return {
      ok: false,
      faults: [
        {
          code: 'too-large',
          path: 'ladder',
          message: `the ladder would generate more than ${maxNodes} nodes; use fewer rounds, a smaller climb range or fewer third-party actions`,
        },
      ],
    };
  }
}

interface Option {
  key: string;
  label: string;
  move: MoveKind;
  shift: number;
}

class Builder {
  count = 0;
  private readonly top: number;
  private readonly names: Map<string, string>;
  private readonly flows: Set<string>;

  constructor(
    private readonly spec: LadderSpec,
    teams: Team[],
    private readonly maxNodes: number,
  ) {
    this.top = spec.rungs.length - 1;
    this.names = new Map(teams.map((t) => [t.id, t.name]));
    this.flows = new Set(spec.flows ?? []);
  }

  private counted<N extends GameNode>(node: N): N {
    if (++this.count > this.maxNodes) throw new TooLarge();
    return node;
  }

  private rungName(level: number): string {
    return this.spec.rungs[level]!.name;
  }

  /** Start of round r with the crisis at `level`. */
  round(r: number, level: number, totals: Totals, id: string): GameNode {
    if (r > this.spec.rounds) return this.ending(id, level, totals, `Standoff at ${this.rungName(level)} after round ${this.spec.rounds}`);
    if (this.spec.simultaneousRound === r) return this.simultaneous(r, level, totals, id);
    return this.partyMove(r, 0, level, totals, id);
  }

  /** Moves open to a party with the crisis at `level`. */
  private options(level: number): Option[] {
    const { moves } = this.spec;
    const out: Option[] = [];
    for (let j = 1; j <= moves.climbUpTo && level + j <= this.top; j++) {
      out.push({ key: `up${j}`, label: j === 1 ? `Climb to ${this.rungName(level + j)}` : `Climb ${j} rungs to ${this.rungName(level + j)}`, move: 'climb', shift: j });
    }
    if (moves.hold) out.push({ key: 'hold', label: `Hold at ${this.rungName(level)}`, move: 'hold', shift: 0 });
    if (moves.stepDown && level > 0) out.push({ key: 'down', label: `Step down to ${this.rungName(level - 1)}`, move: 'step-down', shift: -1 });
    if (moves.settle) out.push({ key: 'settle', label: 'Settle', move: 'settle', shift: 0 });
    return out;
  }

  private partyMove(r: number, p: number, level: number, totals: Totals, id: string): GameNode {
    if (p === this.spec.parties.length) return this.afterParties(r, level, totals, id);
    const team = this.spec.parties[p]!;
    const actions: Action[] = this.options(level).map((o) => {
      const next = childId(id, o.key);
      const to = level + o.shift;
      let node: GameNode;
      if (o.move === 'settle') {
        node = this.ending(next, level, this.roundEnd(this.concede(totals, [team]), level), `Settled by ${this.names.get(team)} at ${this.rungName(level)} (round ${r})`);
      } else if (to === this.top) {
        node = this.ending(next, to, this.roundEnd(totals, to), `Escalation reaches ${this.rungName(to)} (round ${r})`);
      } else node = this.partyMove(r, p + 1, to, o.move === 'step-down' ? this.backDown(totals, [team]) : totals, next);
      return { label: o.label, move: o.move, rung: to, next: node };
    });
    return this.counted({ id, kind: 'decision', team, actions });
  }

  /** The parties choose at once: a chain of decision nodes, each later party in one information set. */
  private simultaneous(r: number, level: number, totals: Totals, id: string): GameNode {
    const parties = this.spec.parties;
    const options = this.options(level);
    const build = (p: number, chosen: Option[], nodeId: string): GameNode => {
      if (p === parties.length) return this.resolveSimultaneous(r, level, totals, chosen, nodeId);
      const team = parties[p]!;
      const actions: Action[] = options.map((o) => ({
        label: o.label,
        move: o.move,
        rung: level + o.shift,
        next: build(p + 1, [...chosen, o], childId(nodeId, o.key)),
      }));
      return this.counted({ id: nodeId, kind: 'decision', team, ...(p > 0 ? { infoset: `h:${id}:${team}` } : {}), actions });
    };
    return build(0, [], id);
  }

  private resolveSimultaneous(r: number, level: number, totals: Totals, chosen: Option[], id: string): GameNode {
    const parties = this.spec.parties;
    const settlers = parties.filter((_, p) => chosen[p]!.move === 'settle');
    if (settlers.length > 0) {
      const who = settlers.map((t) => this.names.get(t)).join(' and ');
      return this.ending(id, level, this.roundEnd(this.concede(totals, settlers), level), `Settled by ${who} at ${this.rungName(level)} (round ${r})`);
    }
    const to = Math.max(0, Math.min(this.top, level + chosen.reduce((s, o) => s + o.shift, 0)));
    if (to === this.top) return this.ending(id, to, this.roundEnd(totals, to), `Escalation reaches ${this.rungName(to)} (round ${r})`);
    const backedDown = parties.filter((_, p) => chosen[p]!.move === 'step-down');
    return this.afterParties(r, to, this.backDown(totals, backedDown), id);
  }

  /** End of the parties' moves in round r: the round's flows, then the third party, then chance. */
  private afterParties(r: number, level: number, totals: Totals, id: string): GameNode {
    const ended = this.roundEnd(totals, level);
    const tp = this.spec.thirdParty;
    if (!tp || level < tp.fromRung) return this.afterThirdParty(r, level, ended, id);
    const actions: Action[] = tp.actions.map((a) => {
      const next = childId(id, a.key);
      const to = Math.max(0, Math.min(this.top, level + a.shift));
      const after = add(ended, a.attributes);
      let node: GameNode;
      if (a.ends) node = this.ending(next, to, after, `${a.label} at ${this.rungName(to)} (round ${r})`);
      else if (to === this.top) node = this.ending(next, to, after, `Escalation reaches ${this.rungName(to)} (round ${r})`);
      else node = this.afterThirdParty(r, to, after, next);
      return { label: a.label, move: 'third-party', rung: to, next: node };
    });
    return this.counted({ id, kind: 'decision', team: tp.team, actions });
  }

  private afterThirdParty(r: number, level: number, totals: Totals, id: string): GameNode {
    const chance = this.spec.chance;
    if (!chance || chance.afterRound !== r || level < (chance.fromRung ?? 0)) return this.round(r + 1, level, totals, id);
    const outcomes: ChanceOutcome[] = chance.outcomes.map((o) => {
      const next = childId(id, o.key);
      const to = Math.max(0, Math.min(this.top, level + o.shift));
      const after = add(totals, o.attributes);
      const node = to === this.top ? this.ending(next, to, after, `${o.label}: escalation reaches ${this.rungName(to)} (round ${r})`) : this.round(r + 1, to, after, next);
      return { label: o.label, p: o.p, rung: to, next: node };
    });
    return this.counted({ id, kind: 'chance', outcomes });
  }

  /** Totals after a round that ends at `level`: the flows of that rung added. */
  private roundEnd(totals: Totals, level: number): Totals {
    const rung = this.spec.rungs[level]!;
    const flows = Object.fromEntries(Object.entries(rung.attributes ?? {}).filter(([k]) => this.flows.has(k)));
    return add(totals, flows);
  }

  private concede(totals: Totals, teams: string[]): Totals {
    return teams.reduce((acc, team) => add(acc, this.spec.concessions?.[team]), totals);
  }

  private backDown(totals: Totals, teams: string[]): Totals {
    return teams.reduce((acc, team) => add(acc, this.spec.stepDownCosts?.[team]), totals);
  }

  /** A terminal: stock attributes of the final rung plus the accumulated totals. */
  private ending(id: string, level: number, totals: Totals, outcome: string): GameNode {
    const rung = this.spec.rungs[level]!;
    const stock = Object.fromEntries(Object.entries(rung.attributes ?? {}).filter(([k]) => !this.flows.has(k)));
    const all = add(totals, stock);
    const attributes = Object.fromEntries([...all].map(([k, v]) => [k, asNum(v)]));
    return this.counted({ id, kind: 'terminal', outcome, attributes });
  }
}

function add(totals: Totals, values: Record<string, Num> | undefined): Totals {
  if (!values) return totals;
  const out = new Map(totals);
  for (const [k, v] of Object.entries(values)) out.set(k, (out.get(k) ?? new Fraction(0)).add(toExact(v)));
  return out;
}

/** A whole number as a JSON number, anything else as an exact string. */
function asNum(f: Fraction): Num {
  return f.d === 1n ? Number(f.s * f.n) : formatExact(f);
}
