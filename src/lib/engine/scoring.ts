/**
 * Terminal scoring. A terminal either names a payoff for every team, or describes the
 * outcome by attributes; then team t scores it as
 *   sum over attributes k of weights[t][k] * sign(k) * attributes[k],
 * where sign(k) is +1 for "more-is-better" attributes and -1 for "less-is-better" ones.
 * A positive weight means the team wants the attribute to move in its better direction.
 */
import { Fraction, toExact } from './numbers';
import type { Game, TerminalNode } from './model';

function attributeSigns(game: Game): Map<string, number> {
  return new Map((game.attributes ?? []).map((a) => [a.key, a.direction === 'less-is-better' ? -1 : 1]));
}

/** Exact payoff of every team (in game.teams order) at a terminal. Throws on a gap validation reports. */
export function terminalPayoffs(game: Game, node: TerminalNode, signs = attributeSigns(game)): Fraction[] {
  return game.teams.map((team) => {
    const direct = node.payoffs?.[team.id];
    if (direct !== undefined) return toExact(direct);
    const weights = game.weights?.[team.id];
    if (!weights || !node.attributes) {
      throw new Error(`terminal ${node.id} has no payoff for team ${team.id}`);
    }
    let total = new Fraction(0);
    for (const [key, value] of Object.entries(node.attributes)) {
      const weight = weights[key];
      if (weight === undefined) continue;
      total = total.add(toExact(weight).mul(toExact(value)).mul(signs.get(key) ?? 1));
    }
    return total;
  });
}

/** A scorer reusing the attribute signs across many terminals. */
export function payoffScorer(game: Game): (node: TerminalNode) => Fraction[] {
  const signs = attributeSigns(game);
  return (node) => terminalPayoffs(game, node, signs);
}
