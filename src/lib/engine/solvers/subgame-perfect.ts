/**
 * Subgame-perfect equilibria of games with imperfect information, by rolling values up
 * through the proper subgames from the bottom. Each proper subgame, with its nested
 * proper subgames already replaced by their values, is solved by the method that fits:
 *  - a single decision or chance node: backward induction (all tied choices count);
 *  - a two-team simultaneous stage: all equilibria by support enumeration;
 *  - any other two-team part: one equilibrium by Lemke's algorithm on the sequence form;
 *  - more than two teams: pure equilibria by enumeration when the part is small.
 * The equilibria of the parts combine into subgame-perfect equilibria; they are counted
 * by distinct values, as strategy profiles and as distinct plays (what happens on the
 * path), and the first K are listed. Perfect-information games go to backward induction
 * directly.
 */
import { CHANCE, TERMINAL, compiledGame, isPerfectInformation, parentsOf, type FlatGame } from '../compile';
import type { Game } from '../model';
import { exactField, floatField, type Field } from '../numbers';
import {
  addToSummary,
  advanceOdometer,
  chanceSummary,
  decisionSummary,
  emptySummary,
  equilibriumPlays,
  singleSummary,
  summaryTotal,
  type EquilibriumPlays,
  type Summary,
} from '../enumeration';
import { numbersOf, toEquilibrium, type Behaviour, type Equilibrium } from '../profile';
import { movers, type ReducedGame, type ReducedInfoset, type ReducedNode, type ReducedSolution } from '../reduced';
import { properSubgameRoots } from '../subgames';
import { backwardInduction } from './backward-induction';
import { pureEquilibria } from './pure-enumeration';
import { sequenceFormEquilibrium } from './sequence-form';
import { bimatrixEquilibria } from './support-enumeration';

export interface SubgamePerfectOptions {
  exact?: boolean;
  /** How many equilibria to list (default 1). */
  maxListed?: number;
}

export interface StageCounts {
  decision: number;
  chance: number;
  simultaneous: number;
  sequenceForm: number;
  pure: number;
}

export interface SubgamePerfectResult extends EquilibriumPlays {
  method: string;
  exact: boolean;
  /** Number of subgame-perfect equilibria (strategy profiles; in mixed stages, the extreme equilibria). */
  count: number;
  /** False when the count is a lower bound: Lemke's method finds one equilibrium of a part, pure enumeration only pure ones, or caps were reached. */
  countExact: boolean;
  /** True when some simultaneous stage has continua of equilibria between the listed extreme ones (which alone are counted). */
  continua: boolean;
  stages: StageCounts;
  equilibria: Equilibrium[];
}

export function solveSubgamePerfect(game: Game, options: SubgamePerfectOptions = {}): SubgamePerfectResult {
  const flat = compiledGame(game);
  const maxListed = Math.max(1, options.maxListed ?? 1);
  if (isPerfectInformation(flat)) {
    const bi = backwardInduction(game, { exact: options.exact, maxListed });
    const decisions = flat.infosetCount;
    return {
      method: bi.method,
      exact: bi.exact,
      count: bi.count,
      countExact: bi.countExact,
      plays: bi.plays,
      playsExact: bi.playsExact,
      playPayoffs: bi.playPayoffs,
      distinctPayoffs: bi.distinctPayoffs,
      continua: false,
      stages: { decision: decisions, chance: 0, simultaneous: 0, sequenceForm: 0, pure: 0 },
      equilibria: bi.equilibria,
    };
  }
  const field = options.exact ? exactField : floatField;
  return report(flat, field as Field<unknown>, maxListed);
}

function report<T>(flat: FlatGame, field: Field<T>, maxListed: number): SubgamePerfectResult {
  const roll = rollUp(flat, field, numbersOf(flat, field), maxListed);
  const used = Object.entries(roll.stages)
    .filter(([, n]) => n > 0)
    .map(([kind, n]) => `${STAGE_NAMES[kind as keyof StageCounts]} ${n}`)
    .join(', ');
  return {
    method: `subgame-perfect roll-up (${field.exact ? 'exact' : 'float'}): ${used}`,
    exact: field.exact,
    count: roll.count,
    countExact: roll.countExact,
    ...roll.plays,
    continua: roll.continua,
    stages: roll.stages,
    equilibria: roll.behaviours.map((b, j) => toEquilibrium(flat, field, b, roll.rootValues[j])),
  };
}

const STAGE_NAMES: Record<keyof StageCounts, string> = {
  decision: 'backward induction steps',
  chance: 'chance steps',
  simultaneous: 'simultaneous stages by support enumeration',
  sequenceForm: 'parts by sequence-form Lemke',
  pure: 'parts by pure-strategy enumeration',
};

interface Entry<T> {
  value: T[];
  profile: Map<number, T[]>;
  /** Entry index chosen in each nested leaf (in leaf order). */
  picks: number[];
}

interface Part<T> {
  /** Flat indices of the leaves of the reduced game (terminals or nested subgame roots). */
  leaves: number[];
  summary?: Summary<T>;
  entries: Entry<T>[];
}

interface RollUp<T> {
  behaviours: Behaviour<T>[];
  rootValues: T[][];
  count: number;
  countExact: boolean;
  plays: EquilibriumPlays;
  continua: boolean;
  stages: StageCounts;
}

/** Largest number of value combinations of nested parts tried when counting a part's equilibria. */
const COMBINATION_CAP = 256;

/**
 * The roll-up over a flat game: every proper subgame bottom-up, its equilibria listed
 * (the first K) and counted.
 */
function rollUp<T>(flat: FlatGame, field: Field<T>, numbers: { payoff: T[]; prob: T[] }, maxListed: number): RollUp<T> {
  const roots = properSubgameRoots(flat);
  const parts: Part<T>[] = new Array(flat.size);
  const stages: StageCounts = { decision: 0, chance: 0, simultaneous: 0, sequenceForm: 0, pure: 0 };
  let complete = true;
  let continua = false;
  for (let i = flat.size - 1; i >= 0; i--) {
    if (flat.mover[i] === TERMINAL) {
      const part = terminalPart(flat, numbers.payoff, i);
      part.summary = singleSummary(part.entries[0]!.value);
      parts[i] = part;
      continue;
    }
    if (!roots[i]) continue;
    const { game, leaves } = reducedGame(flat, numbers.prob, roots, i);
    const solver = new PartSolver(field, game, leaves, parts);
    const part: Part<T> = { leaves, entries: solver.list(maxListed), summary: solver.count() };
    stages[solver.kind]++;
    complete &&= solver.complete;
    continua ||= solver.continuum;
    parts[i] = part;
  }
  const top = parts[0]!;
  const behaviours = top.entries.map((_, j) => materialize(flat, parts, j));
  const count = summaryTotal(top.summary!);
  return {
    behaviours,
    rootValues: top.entries.map((e) => e.value),
    count,
    countExact: complete && !top.summary!.truncated && Number.isSafeInteger(count),
    plays: equilibriumPlays(field, top.summary!, complete, top.entries[0]!.value),
    continua,
    stages,
  };
}

/**
 * The first subgame-perfect equilibrium, kept live so that terminal payoffs can be
 * altered and only the proper subgames above them re-solved (sensitivity analysis, Monte
 * Carlo). Re-solving stops climbing where a part's value comes out unchanged: the parts
 * above it would be solved from the same numbers.
 */
export class RollUpSession<T> {
  private readonly parts: Part<T>[];
  private readonly solvers = new Map<number, PartSolver<T>>();
  private readonly parent: Int32Array;
  private readonly roots: Uint8Array;
  /** The behaviour of the current first equilibrium, kept up to date part by part. */
  private readonly live: Behaviour<T>;
  /** What play looks like in each part (for playSignature), until the part is re-solved. */
  private readonly looks = new Map<number, { support: string; reaches: Map<number, boolean> }>();
  /** Each part's first solution with its leaf values as built: a payoff set back finds it again unsolved. */
  private readonly initial = new Map<number, { leafValues: T[][]; entry: Entry<T> }>();

  constructor(
    private readonly flat: FlatGame,
    private readonly field: Field<T>,
    private readonly numbers: { payoff: T[]; prob: T[] },
  ) {
    this.roots = properSubgameRoots(flat);
    this.parent = parentsOf(flat);
    this.parts = new Array(flat.size);
    for (let i = flat.size - 1; i >= 0; i--) {
      if (flat.mover[i] === TERMINAL) this.parts[i] = terminalPart(flat, numbers.payoff, i);
      else if (this.roots[i]) {
        const { game, leaves } = reducedGame(flat, numbers.prob, this.roots, i);
        const solver = new PartSolver(field, game, leaves, this.parts);
        this.solvers.set(i, solver);
        this.parts[i] = { leaves, entries: solver.list(1) };
        this.initial.set(i, { leafValues: this.leafValues(i), entry: this.parts[i]!.entries[0]! });
      }
    }
    this.live = materialize(flat, this.parts, 0);
  }

  private leafValues(root: number): T[][] {
    return this.parts[root]!.leaves.map((leaf) => this.parts[leaf]!.entries[0]!.value);
  }

  private sameValue(a: T[], b: T[]): boolean {
    return a.every((v, t) => v === b[t] || (this.field.exact && this.field.cmp(v, b[t]!) === 0));
  }

  /** Re-solve one part; true when its value changed. */
  private resolve(root: number): boolean {
    const part = this.parts[root]!;
    const before = part.entries[0]!.value;
    const initial = this.initial.get(root)!;
    const values = this.leafValues(root);
    const entry = values.every((v, k) => this.sameValue(v, initial.leafValues[k]!)) ? initial.entry : this.solvers.get(root)!.first();
    part.entries = [entry];
    this.looks.delete(root);
    for (const [infoset, probs] of entry.profile) this.live[infoset] = probs;
    return !this.sameValue(entry.value, before);
  }

  /** Re-solve, bottom-up, the candidate parts (descending flat index) that have a changed leaf. */
  private settle(candidates: number[], changed: Set<number>) {
    for (const root of candidates) {
      if (this.parts[root]!.leaves.some((leaf) => changed.has(leaf)) && this.resolve(root)) changed.add(root);
    }
  }

  private writePayoff(terminal: number, team: number, value: T) {
    this.numbers.payoff[this.flat.aux[terminal]! * this.flat.teams + team] = value;
    this.parts[terminal] = terminalPart(this.flat, this.numbers.payoff, terminal);
  }

  /** Roots of the proper subgames containing node i, innermost first. */
  chainAbove(i: number): number[] {
    const chain: number[] = [];
    for (let x = this.parent[i]!; x >= 0; x = this.parent[x]!) if (this.roots[x]) chain.push(x);
    return chain;
  }

  /** Teams that move inside the part rooted at `root` (not in its nested parts). */
  moversIn(root: number): number[] {
    return movers(this.solvers.get(root)!.game);
  }

  payoff(terminal: number, team: number): T {
    return this.numbers.payoff[this.flat.aux[terminal]! * this.flat.teams + team]!;
  }

  /** Set one payoff and re-solve the parts above it (`chain`: chainAbove(terminal), when the caller keeps it). */
  setPayoff(terminal: number, team: number, value: T, chain = this.chainAbove(terminal)) {
    this.writePayoff(terminal, team, value);
    this.settle(chain, new Set([terminal]));
  }

  /** Set several payoffs, then re-solve the parts above any of them, bottom-up. */
  setPayoffs(changes: { terminal: number; team: number; value: T }[]) {
    const roots = new Set<number>();
    for (const { terminal, team, value } of changes) {
      this.writePayoff(terminal, team, value);
      for (const root of this.chainAbove(terminal)) roots.add(root);
    }
    // Children have larger flat indices than their parents: descending order is bottom-up.
    this.settle([...roots].sort((a, b) => b - a), new Set(changes.map((c) => c.terminal)));
  }

  /**
   * True when moving one terminal payoff of `team` any distance in `direction` (+1 up, -1
   * down) can change no choice in the parts of `chain` (chainAbove(terminal)). Going up
   * from the terminal, the moved number is one team's value of a leaf, moving the same way:
   * a decision of another team, a chance node, or a simultaneous stage the team takes no
   * part in keep their choices (they read other teams' values only); the team's own
   * decision keeps its choice when the chosen leaf gains or a leaf not chosen loses (the
   * earlier action still wins ties). A part whose play does not reach the leaf passes
   * nothing further up. Any other part may change, and the answer is false.
   */
  choicesFixed(terminal: number, team: number, direction: 1 | -1, chain: number[]): boolean {
    let leaf = terminal;
    for (const root of chain) {
      const solver = this.solvers.get(root)!;
      const part = this.parts[root]!;
      const reached = solver.reaches(part.entries[0]!.profile, part.leaves.indexOf(leaf));
      if (solver.kind === 'decision') {
        if (solver.game.nodes[0]!.team === team && direction > 0 !== reached) return false;
      } else if (solver.kind === 'simultaneous') {
        if (movers(solver.game).includes(team)) return false;
      } else if (solver.kind !== 'chance') return false;
      if (!reached) return true;
      leaf = root;
    }
    return true;
  }

  /** What equilibrium play does along a chain: the supports of the reached information sets of its parts. */
  playSignature(chain: number[]): string {
    const pieces: string[] = [];
    let reached = true;
    for (let c = chain.length - 1; c >= 0 && reached; c--) {
      const look = this.look(chain[c]!);
      pieces.push(look.support);
      if (c > 0) reached = this.reachesPart(chain[c]!, look, chain[c - 1]!);
    }
    return pieces.join('|');
  }

  private look(root: number) {
    let look = this.looks.get(root);
    if (!look) {
      look = { support: this.solvers.get(root)!.support(this.parts[root]!.entries[0]!.profile), reaches: new Map() };
      this.looks.set(root, look);
    }
    return look;
  }

  /** Whether play in the part at `root` reaches its nested part at `below`. */
  private reachesPart(root: number, look: { reaches: Map<number, boolean> }, below: number): boolean {
    let reached = look.reaches.get(below);
    if (reached === undefined) {
      const part = this.parts[root]!;
      reached = this.solvers.get(root)!.reaches(part.entries[0]!.profile, part.leaves.indexOf(below));
      look.reaches.set(below, reached);
    }
    return reached;
  }

  /** The current equilibrium's behaviour: a live view, updated by setPayoff(s); do not modify it. */
  behaviour(): Behaviour<T> {
    return this.live;
  }

  rootValue(): T[] {
    return this.parts[0]!.entries[0]!.value;
  }
}

function terminalPart<T>(flat: FlatGame, payoff: T[], i: number): Part<T> {
  const value = payoff.slice(flat.aux[i]! * flat.teams, (flat.aux[i]! + 1) * flat.teams);
  return { leaves: [], entries: [{ value, profile: new Map(), picks: [] }] };
}

/** The reduced game of the proper subgame rooted at flat node `root`. */
function reducedGame<T>(flat: FlatGame, prob: T[], roots: Uint8Array, root: number) {
  const nodes: ReducedNode<T>[] = [];
  const infosets = new Map<number, ReducedInfoset>();
  const leaves: number[] = [];
  const queue = [root];
  for (let head = 0; head < queue.length; head++) {
    const i = queue[head]!;
    const isLeaf = head > 0 && (flat.mover[i] === TERMINAL || roots[i] === 1);
    if (isLeaf) {
      nodes.push({ kind: 'leaf', children: [] });
      leaves.push(i);
      continue;
    }
    const children: number[] = [];
    for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) {
      children.push(queue.length);
      queue.push(c);
    }
    if (flat.mover[i] === CHANCE) {
      nodes.push({ kind: 'chance', probs: prob.slice(flat.aux[i]!, flat.aux[i]! + children.length), children });
    } else {
      const infoset = flat.aux[i]!;
      nodes.push({ kind: 'decision', team: flat.mover[i]!, infoset, children });
      const h = infosets.get(infoset) ?? { team: flat.mover[i]!, actions: children.length, members: [] };
      h.members.push(head);
      infosets.set(infoset, h);
    }
  }
  return { game: { teams: flat.teams, nodes, infosets } as ReducedGame<T>, leaves };
}

type PartKind = keyof StageCounts;

/** A part's equilibria for one set of leaf values, and whether a continuum of equilibria lies between them. */
interface Solved<T> {
  solutions: ReducedSolution<T>[];
  continuum: boolean;
}

/** Solves one reduced game for given leaf values, and combines nested equilibria. */
class PartSolver<T> {
  readonly kind: PartKind;
  complete = true;
  continuum = false;
  private readonly leafNodes: number[];
  private readonly cache = new Map<string, Solved<T>>();

  constructor(
    private readonly field: Field<T>,
    readonly game: ReducedGame<T>,
    private readonly leaves: number[],
    private readonly parts: Part<T>[],
  ) {
    this.leafNodes = game.nodes.flatMap((n, local) => (n.kind === 'leaf' ? [local] : []));
    this.kind = classify(game);
  }

  /** The first K equilibria, over tuples of nested entries in lexicographic order. */
  list(maxListed: number): Entry<T>[] {
    const lists = this.leaves.map((leaf) => this.parts[leaf]!.entries);
    const sizes = lists.map((l) => l.length);
    const picks = lists.map(() => 0);
    const out: Entry<T>[] = [];
    for (;;) {
      const values = lists.map((l, k) => l[picks[k]!]!.value);
      for (const solution of this.solve(values).solutions) {
        if (out.length < maxListed) out.push({ value: solution.value, profile: solution.profile, picks: [...picks] });
      }
      if (out.length >= maxListed || !advanceOdometer(picks, sizes)) return out;
    }
  }

  /** The first equilibrium over the first entries of the nested parts, solved afresh: a live session's leaf values seldom repeat, so it skips the memo. */
  first(): Entry<T> {
    this.leafNodes.forEach((local, k) => (this.game.nodes[local]!.value = this.parts[this.leaves[k]!]!.entries[0]!.value));
    const solution = this.solveNow().solutions[0];
    if (!solution) throw new Error('internal: a part of the game has no equilibrium');
    return { value: solution.value, profile: solution.profile, picks: this.leaves.map(() => 0) };
  }

  /**
   * Distinct values of this part's equilibria with their counts and plays. A play of the
   * part is its behaviour where it reaches plus a play of each nested part it reaches:
   * combinations that differ only in nested parts it does not reach are one play.
   */
  count(): Summary<T> {
    const nested = this.leaves.map((leaf) => this.parts[leaf]!.summary!);
    const root = this.game.nodes[0]!;
    if (this.kind === 'decision') return decisionSummary(this.field, root.team!, nested);
    if (this.kind === 'chance') return chanceSummary(this.field, nested, root.probs!);
    const out = emptySummary<T>(nested.some((s) => s.truncated));
    const seen = new Set<string>();
    const sizes = nested.map((s) => s.values.length);
    const picks = nested.map(() => 0);
    for (let tried = 0; ; tried++) {
      if (tried >= COMBINATION_CAP) {
        out.truncated = true;
        return out;
      }
      const values = nested.map((s, k) => s.values[picks[k]!]!);
      const weight = nested.reduce((n, s, k) => n * s.counts[picks[k]!]!, 1);
      const { solutions, continuum } = this.solve(values);
      for (const solution of solutions) {
        const { key, leaves } = this.playOf(solution.profile, picks);
        const fresh = !seen.has(key);
        seen.add(key);
        const plays = fresh ? leaves.reduce((n, k) => n * nested[k]!.plays[picks[k]!]!, 1) : 0;
        const open = fresh && (continuum || leaves.some((k) => nested[k]!.open[picks[k]!]));
        addToSummary(this.field, out, solution.value, weight, plays, open);
      }
      if (!advanceOdometer(picks, sizes)) return out;
    }
  }

  /** The play a solution makes with the nested values picked (as a key), and the leaves it reaches (in leaf order). */
  private playOf(profile: Map<number, T[]>, picks: number[]): { key: string; leaves: number[] } {
    const reach = this.localReach(profile);
    const leaves = this.leafNodes.flatMap((local, k) => (this.field.cmp(reach[local]!, this.field.zero) > 0 ? [k] : []));
    const spell = (p: T) => this.field.format(p) ?? this.field.toNumber(p).toPrecision(12);
    const behaviour = this.reachedInfosets(reach).map((h) => `${h}:${profile.get(h)!.map(spell).join('/')}`);
    return { key: `${behaviour.join(',')}|${leaves.map((k) => `${k}:${picks[k]}`).join(',')}`, leaves };
  }

  private solve(leafValues: T[][]): Solved<T> {
    const key = leafValues.map((v) => v.map((x) => String(this.field.format(x) ?? this.field.toNumber(x))).join(',')).join(';');
    const cached = this.cache.get(key);
    if (cached) return cached;
    this.leafNodes.forEach((local, k) => (this.game.nodes[local]!.value = leafValues[k]!));
    const solved = this.solveNow();
    this.continuum ||= solved.continuum;
    if (this.cache.size >= 64) this.cache.clear();
    this.cache.set(key, solved);
    return solved;
  }

  /** Probability of reaching each local node under a profile of this part. */
  private localReach(profile: Map<number, T[]>): T[] {
    const { field, game } = this;
    const reach: T[] = new Array(game.nodes.length).fill(field.zero);
    reach[0] = field.one;
    game.nodes.forEach((node, i) => {
      if (node.kind === 'leaf') return;
      const weights = node.kind === 'chance' ? node.probs! : profile.get(node.infoset!)!;
      node.children.forEach((c, k) => (reach[c] = field.mul(reach[i]!, weights[k]!)));
    });
    return reach;
  }

  /** Information sets with a member reached with positive probability, in index order. */
  private reachedInfosets(reach: T[]): number[] {
    const reached = new Set<number>();
    this.game.nodes.forEach((node, i) => {
      if (node.kind === 'decision' && this.field.cmp(reach[i]!, this.field.zero) > 0) reached.add(node.infoset!);
    });
    return [...reached].sort((a, b) => a - b);
  }

  /** Supports of the information sets this profile reaches, as text. */
  support(profile: Map<number, T[]>): string {
    return this.reachedInfosets(this.localReach(profile))
      .map((h) => `${h}:${profile.get(h)!.flatMap((p, k) => (this.field.cmp(p, this.field.zero) > 0 ? [k] : [])).join('.')}`)
      .join(',');
  }

  /** Whether the profile reaches the leaf with this index (in leaf order). */
  reaches(profile: Map<number, T[]>, leafIndex: number): boolean {
    const reach = this.localReach(profile);
    return this.field.cmp(reach[this.leafNodes[leafIndex]!]!, this.field.zero) > 0;
  }

  private solveNow(): Solved<T> {
    const { field, game } = this;
    const root = game.nodes[0]!;
    const leafValue = (local: number) => game.nodes[local]!.value!;
    const isolated = (solutions: ReducedSolution<T>[]) => ({ solutions, continuum: false });
    switch (this.kind) {
      case 'decision': {
        const values = root.children.map(leafValue);
        let best = values[0]![root.team!]!;
        for (const v of values) if (field.cmp(v[root.team!]!, best) > 0) best = v[root.team!]!;
        return isolated(
          values.flatMap((v, a) =>
            field.cmp(v[root.team!]!, best) === 0
              ? [{ value: v, profile: new Map([[root.infoset!, values.map((_, k) => (k === a ? field.one : field.zero))]]) }]
              : [],
          ),
        );
      }
      case 'chance': {
        const values = root.children.map(leafValue);
        const value = values[0]!.map((_, t) => values.reduce((s, v, c) => field.add(s, field.mul(root.probs![c]!, v[t]!)), field.zero));
        return isolated([{ value, profile: new Map() }]);
      }
      case 'simultaneous':
        return this.simultaneous();
      case 'sequenceForm':
        this.complete = false;
        return isolated([sequenceFormEquilibrium(field, game)]);
      case 'pure': {
        this.complete = false;
        const found = pureEquilibria(field, game);
        if (found.length === 0) throw new Error('a part of the game with more than two teams has no pure equilibrium; mixed equilibria of such parts are not computed');
        return isolated(found);
      }
    }
  }

  private simultaneous(): Solved<T> {
    const { field, game } = this;
    const root = game.nodes[0]!;
    const second = game.nodes[root.children[0]!]!;
    const [a, b] = [root.team!, second.team!];
    const A = root.children.map((r) => game.nodes[r]!.children.map((c) => game.nodes[c]!.value![a]!));
    const B = root.children.map((r) => game.nodes[r]!.children.map((c) => game.nodes[c]!.value![b]!));
    const { equilibria, continuum } = bimatrixEquilibria(field, A, B);
    const solutions = equilibria.map((e) => {
      const profile = new Map([
        [root.infoset!, e.row],
        [second.infoset!, e.col],
      ]);
      const value = Array.from({ length: game.teams }, (_, t) =>
        root.children.reduce(
          (sum, r, i) =>
            game.nodes[r]!.children.reduce((s, c, j) => field.add(s, field.mul(field.mul(e.row[i]!, e.col[j]!), game.nodes[c]!.value![t]!)), sum),
          field.zero,
        ),
      );
      return { value, profile };
    });
    return { solutions, continuum };
  }
}

function classify<T>(game: ReducedGame<T>): PartKind {
  const root = game.nodes[0]!;
  const allLeaves = (ids: number[]) => ids.every((c) => game.nodes[c]!.kind === 'leaf');
  if (allLeaves(root.children)) return root.kind === 'chance' ? 'chance' : 'decision';
  const teams = new Set([...game.infosets.values()].map((h) => h.team));
  if (root.kind === 'decision' && teams.size === 2 && game.infosets.get(root.infoset!)!.members.length === 1) {
    const seconds = root.children.map((c) => game.nodes[c]!);
    const set = seconds[0]!.infoset;
    const isStage =
      seconds.every((n) => n.kind === 'decision' && n.infoset === set && n.team !== root.team && allLeaves(n.children)) &&
      game.infosets.get(set!)!.members.length === seconds.length;
    if (isStage) return 'simultaneous';
  }
  return teams.size <= 2 ? 'sequenceForm' : 'pure';
}

function materialize<T>(flat: FlatGame, parts: Part<T>[], j: number): Behaviour<T> {
  const behaviour: Behaviour<T> = new Array(flat.infosetCount);
  const stack: [number, number][] = [[0, j]];
  while (stack.length > 0) {
    const [i, e] = stack.pop()!;
    const part = parts[i]!;
    const entry = part.entries[e]!;
    for (const [infoset, probs] of entry.profile) behaviour[infoset] = probs;
    part.leaves.forEach((leaf, k) => stack.push([leaf, entry.picks[k]!]));
  }
  for (let h = 0; h < behaviour.length; h++) {
    if (!behaviour[h]) throw new Error(`internal: information set ${h} was left without a choice`);
  }
  return behaviour;
}
