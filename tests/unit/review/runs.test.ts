import { describe, expect, it } from 'vitest';
import { compareRuns, csvCell, REVIEW_TABLES, reviewPlay, RUNS_TABLES, toCsv, UNFINISHED } from '../../../src/lib/review';
import { CENTIPEDE, LADDER, playRecord } from './fixtures';

describe('across the runs of one scenario (hand-made runs, no source)', () => {
  const runs = [
    playRecord(LADDER, [['b', 'Raise'], ['w', 'Calm'], ['r', 'Match']], { exerciseId: 'a', title: 'Run A' }),
    playRecord(LADDER, [['b', 'Hold']], { exerciseId: 'b', title: 'Run B' }),
    playRecord(LADDER, [['b', 'Raise'], ['w', 'Calm'], ['r', 'Back down']], { exerciseId: 'c', title: 'Run C' }),
    playRecord(LADDER, [['b', 'Raise']], { exerciseId: 'd', title: 'Run D', state: 'live', endedAt: null }),
  ].map((record) => ({ game: LADDER, record }));
  const overview = compareRuns(runs);

  it('counts how often each rung was chosen, by team, lowest rung first', () => {
    expect(overview.rungs.map((r) => [r.name, r.total, r.byTeam])).toEqual([
      ['Protest', 1, { first: 1 }],
      ['Patrol', 4, { first: 3, second: 1 }],
      ['Harbour closure', 1, { second: 1 }],
    ]);
    expect(overview.rungs.reduce((s, r) => s + r.share, 0)).toBeCloseTo(1, 12);
  });

  it('lists the outcome of every run beside the equilibrium outcome', () => {
    expect(overview.runs.map((r) => [r.title, r.outcome, r.reachedEquilibrium, r.deviations])).toEqual([
      ['Run A', 'Closure and clash', false, 1],
      ['Run B', 'Talks', false, 1],
      ['Run C', 'Red backs down', true, 0],
      ['Run D', null, false, 0],
    ]);
    expect(overview.outcomes).toEqual([
      { outcome: 'Closure and clash', runs: 1, equilibrium: false },
      { outcome: UNFINISHED, runs: 1, equilibrium: false },
      { outcome: 'Red backs down', runs: 1, equilibrium: true },
      { outcome: 'Talks', runs: 1, equilibrium: false },
    ]);
  });

  it('gives the fitted lambda of each team in each run, null where a team made no ladder move', () => {
    expect(Object.keys(overview.runs[0]!.lambdas)).toEqual(['first', 'second']);
    expect(overview.runs[1]!.lambdas.second).toBeNull();
    // With Red unobserved (lambda 0, uniform), Raise is worth 3/4 * (3 - 2) / 2 = 0.375 < 1 for Hold:
    // Hold is the logit-better move, so the likelihood keeps rising with lambda and the fit runs to the bound.
    expect(overview.runs[1]!.lambdas.first).toBeGreaterThan(30);
    expect(overview.runs[1]!.lambdasAtBound).toEqual(['first']);
  });

  it('exports the tables as CSV with a column per team', () => {
    const lines = RUNS_TABLES.runs.csv(overview).split('\r\n');
    expect(lines[0]).toBe('exercise,state,ended,outcome,equilibrium outcome,reached equilibrium,moves,deviations,total regret,lambda Blue,lambda Blue at upper bound,lambda Red,lambda Red at upper bound');
    expect(lines[2]).toMatch(/^Run B,ended,2026-01-05T11:00:00\.000Z,Talks,Red backs down,no,1,1,1\.25,\d+(\.\d+)?,yes,,no$/);
    expect(RUNS_TABLES.rungs.csv(overview).split('\r\n')[2]).toBe('Patrol,2,4,0.6667,3,1');
  });
});

describe('CSV (RFC 4180; formula guard as in the OWASP CSV-injection guidance)', () => {
  it('quotes commas, quotes and line breaks, and ends lines with CRLF', () => {
    const csv = toCsv([{ a: 'plain', b: 'with, comma' }, { a: 'say "no"', b: 'two\nlines' }], [
      { header: 'a', value: (r) => r.a },
      { header: 'b', value: (r) => r.b },
    ]);
    expect(csv).toBe('a,b\r\nplain,"with, comma"\r\n"say ""no""","two\nlines"\r\n');
  });

  it('defuses text a spreadsheet would run as a formula, but writes negative numbers as numbers', () => {
    expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
    expect(csvCell('@cmd')).toBe("'@cmd");
    expect(csvCell(-2.5)).toBe('-2.5');
    expect(csvCell(null)).toBe('');
    expect(csvCell(true)).toBe('yes');
    expect(csvCell(Number.NaN)).toBe('');
  });

  it('writes the move table of a review', () => {
    const review = reviewPlay(CENTIPEDE, playRecord(CENTIPEDE, [['n1', 'Pass'], ['n2', 'Take']]));
    const [header, first] = REVIEW_TABLES.moves.csv(review).split('\r\n');
    expect(header!.startsWith('step,turn,mover,move,kind,equilibrium action,deviated,regret,QRE probability')).toBe(true);
    expect(first!.startsWith('1,1,First,Pass,ladder,Take,yes,0.2,')).toBe(true);
  });
});
