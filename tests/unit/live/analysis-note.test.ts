/** The note beside the Console's equilibrium advice: plays first, profiles after, and a word where play has left the path. */
import { describe, expect, it } from 'vitest';
import { solveSubgamePerfect } from '../../../src/lib/engine';
import { analysisAt, equilibriumNote } from '../../../src/lib/exercise/analysis';
import { stageAt } from '../../../src/lib/exercise/play';
import { scenarioGame } from '../../../src/lib/scenario';
import type { ScenarioInfo } from '../../../src/lib/exercise/scenario-info';
import { demoScenario } from '../../../server/seed/demo-scenario';

const game = scenarioGame(demoScenario());

describe('equilibrium note', () => {
  const unique = { count: 1, countExact: true, plays: 1, playsExact: true, distinctPayoffs: 1 };
  const offPathTies = { count: 294912, countExact: true, plays: 1, playsExact: true, distinctPayoffs: 1 };
  const severalPlays = { count: 12, countExact: true, plays: 3, playsExact: true, distinctPayoffs: 2 };

  it('says nothing for a single equilibrium', () => {
    expect(equilibriumNote(unique, true)).toBeNull();
    expect(equilibriumNote(unique, false)).toBeNull();
  });

  it('leads with the plays', () => {
    expect(equilibriumNote(offPathTies, true)).toBe('From the start: one equilibrium play (294,912 strategy profiles that differ only at moves off the path).');
    expect(equilibriumNote(severalPlays, true)).toBe(
      'From the start: 3 distinct equilibrium plays, with 2 different expected payoffs for the teams (12 strategy profiles); the advice follows the first, others may differ.',
    );
  });

  it('warns where play has left the path and the profiles differ there', () => {
    expect(equilibriumNote(offPathTies, false)).toMatch(/Play has left that path, where those profiles may differ/);
    expect(equilibriumNote({ ...severalPlays, count: 3 }, false)).not.toMatch(/left that path/);
  });

  it('on the demo: no warning on the equilibrium path, a warning off it', () => {
    const scenario = { versionId: 'note-test', game } as ScenarioInfo;
    const eq = solveSubgamePerfect(game).equilibria[0]!;
    const onPath = analysisAt(scenario, stageAt(game, game.root.id), 0.5);
    expect(onPath).toMatchObject({ status: 'ready', equilibrium: { note: 'From the start: one equilibrium play (294,912 strategy profiles that differ only at moves off the path).' } });
    const root = game.root.kind === 'decision' ? game.root : null;
    const offLabel = root!.actions.find((a) => a.label !== eq.path[0])!;
    const offNode = offLabel.next.kind === 'decision' ? offLabel.next : null;
    const off = analysisAt(scenario, stageAt(game, offNode!.id), 0.5);
    expect(off.status === 'ready' && off.equilibrium?.note).toMatch(/Play has left that path/);
  });
});
