import { readFileSync } from 'node:fs';
import Ajv2020 from 'ajv/dist/2020';
import { describe, expect, it } from 'vitest';
import { assessMarks, indexGame, solveSubgamePerfect, stageAt } from '../../../src/lib/engine';
import { parseScenario, regenerateTree, scenarioGame, scenarioJsonSchema, scenarioJsonSchemaText, type Scenario } from '../../../src/lib/scenario';

const demoJson = () => JSON.parse(readFileSync('scenarios/serrin-strait.json', 'utf8'));

function demo(): Scenario {
  const parsed = parseScenario(demoJson());
  if (!parsed.ok) throw new Error(parsed.faults.map((f) => `${f.path}: ${f.message}`).join('\n'));
  return parsed.scenario;
}

function faults(mutate: (doc: Record<string, any>) => void) {
  const doc = demoJson();
  mutate(doc);
  const parsed = parseScenario(doc);
  expect(parsed.ok).toBe(false);
  return parsed.ok ? [] : parsed.faults;
}

describe('scenario schema', () => {
  it('scenarios/schema.json is the schema generated from the zod schemas (run scripts/gen-schema.ts if not)', () => {
    expect(readFileSync('scenarios/schema.json', 'utf8')).toBe(scenarioJsonSchemaText());
  });

  it('the demo scenario validates against the published JSON Schema', () => {
    const validate = new Ajv2020({ allErrors: true, strict: false }).compile(scenarioJsonSchema());
    expect(validate(demoJson()), JSON.stringify(validate.errors?.slice(0, 3))).toBe(true);
  });
});

describe('the Serrin Strait demo', () => {
  const scenario = demo();
  const game = scenarioGame(scenario);
  const index = indexGame(game);

  it('is the tree its ladder generates', () => {
    const regenerated = regenerateTree(scenario);
    expect(regenerated.ok).toBe(true);
    if (!regenerated.ok) return;
    expect(regenerated.result.scenario.tree).toEqual(scenario.tree);
    expect(regenerated.result.dangling).toEqual({ marks: [], payoffRanges: [], injects: [] });
  });

  it('has three teams, eight rungs over three rounds, a simultaneous stage and a chance event, and a size that can be played and drawn', () => {
    expect(scenario.teams.map((t) => t.name)).toEqual(['Velmora', 'Ostrakh', 'Lantern Isles Council']);
    expect(scenario.ladder!.rungs.length).toBeGreaterThanOrEqual(8);
    expect(scenario.ladder!.rounds).toBe(3);
    const kinds = new Set(index.nodes.map((n) => stageAt(game, n.id).kind));
    expect(kinds).toEqual(new Set(['decision', 'simultaneous', 'chance', 'terminal']));
    expect(index.nodes.length).toBeGreaterThan(300);
    expect(index.nodes.length).toBeLessThan(4000);
  });

  it('marks threats and promises, at least one of them not credible', () => {
    const verdicts = assessMarks(game, scenario.marks, { exact: true });
    expect(verdicts.map((v) => [v.kind, v.credible])).toEqual([
      ['threat', true],
      ['threat', false],
      ['promise', false],
    ]);
  });

  it('has payoff ranges, two or three injects, and an equilibrium path through the chance event and the simultaneous stage', () => {
    expect(scenario.payoffRanges.length).toBeGreaterThan(0);
    expect(scenario.injects.length).toBeGreaterThanOrEqual(2);
    expect(scenario.injects.length).toBeLessThanOrEqual(3);
    const eq = solveSubgamePerfect(game, { exact: true }).equilibria[0]!;
    expect(eq.path).toEqual([
      'Hold at Naval shadowing',
      'Hold at Naval shadowing',
      'A quiet night in the channel',
      'Hold at Naval shadowing',
      'Climb to Exclusion zone',
      'Broker a settlement',
    ]);
  });
});

describe('parseScenario faults name the path', () => {
  it('a wrong format tag', () => {
    expect(faults((d) => (d.format = 'other/1'))).toEqual([{ path: 'format', message: 'must be "rungwise.scenario/1"' }]);
  });

  it('a fault inside the tree, with the node path', () => {
    const found = faults((d) => (d.tree.actions[1].label = d.tree.actions[0].label));
    expect(found).toEqual([{ path: 'tree.actions[1].label', message: 'at the root: action label "Climb to Exclusion zone" appears twice' }]);
  });

  it('marks, payoff ranges and injects that do not resolve', () => {
    const found = faults((d) => {
      d.marks[0].nodeId = 'n.nowhere';
      d.marks[1].action = 'Sail away';
      d.payoffRanges[0].distribution = { kind: 'uniform', low: 3, high: 1 };
      d.payoffRanges[1].nodeId = 'n';
      d.injects[0].to = ['velmora', 'atlantis'];
      d.injects[1].id = d.injects[0].id;
    });
    expect(found).toEqual([
      { path: 'marks[0].nodeId', message: '"n.nowhere" is not a decision node of the tree' },
      { path: 'marks[1].action', message: 'there is no action "Sail away" at "n.hold.up1"' },
      { path: 'payoffRanges[0].distribution', message: 'low must not exceed high' },
      { path: 'payoffRanges[1].nodeId', message: '"n" is not a terminal node of the tree' },
      { path: 'injects[0].to[1]', message: 'unknown team "atlantis"' },
      { path: 'injects[1].id', message: 'inject id "minelayers" is used twice' },
    ]);
  });
});

describe('regenerateTree', () => {
  it('reports references that no longer resolve after the ladder changes', () => {
    const scenario = demo();
    const edited: Scenario = { ...scenario, ladder: { ...scenario.ladder!, thirdParty: { ...scenario.ladder!.thirdParty!, fromRung: 4 } } };
    const regenerated = regenerateTree(edited);
    expect(regenerated.ok).toBe(true);
    if (!regenerated.ok) return;
    expect(regenerated.result.dangling.marks).toEqual([1]);
    expect(regenerated.result.scenario.tree).not.toEqual(scenario.tree);
  });

  it('refuses a scenario without a ladder', () => {
    const { ladder: _, ...rest } = demo();
    expect(regenerateTree(rest as Scenario)).toEqual({ ok: false, faults: [{ path: 'ladder', message: 'this scenario has no ladder to generate a tree from' }] });
  });
});
