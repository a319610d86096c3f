import { describe, expect, it } from 'vitest';
import { changedPaths, describeChange, PATH_LIMIT } from '../../../src/lib/studio/diff';

describe('studio: change log paths', () => {
  it('names each changed leaf by its JSON path', () => {
    const before = { title: 'A', teams: [{ id: 'blue', name: 'Blue' }, { id: 'red', name: 'Red' }], root: { payoffs: { blue: 1, red: 2 } } };
    const after = { title: 'A', teams: [{ id: 'blue', name: 'Azure' }, { id: 'red', name: 'Red' }], root: { payoffs: { blue: 1, red: 3 } } };
    expect(changedPaths(before, after)).toEqual(['teams[0].name', 'root.payoffs.red']);
  });

  it('reports an added or removed value once, without descending into it', () => {
    expect(changedPaths({ a: [1] }, { a: [1, { deep: { er: 1 } }] })).toEqual(['a[1]']);
    expect(changedPaths({ a: 1, b: { c: 1 } }, { a: 1 })).toEqual(['b']);
    expect(changedPaths({ a: 1 }, { a: 1 })).toEqual([]);
  });

  it('stops at the limit and says so', () => {
    const before = { xs: Array.from({ length: 500 }, () => 0) };
    const after = { xs: Array.from({ length: 500 }, () => 1) };
    const paths = changedPaths(before, after);
    expect(paths).toHaveLength(PATH_LIMIT);
    expect(describeChange(paths, (s) => s)).toBe(`Edited xs (${PATH_LIMIT} or more places)`);
  });

  it('summarises by the parts a person knows', () => {
    const names: Record<string, string> = { teams: 'the teams', root: 'the tree', ladder: 'the ladder' };
    expect(describeChange(['teams[0].name'], (s) => names[s]!)).toBe('Edited the teams (1 place)');
    expect(describeChange(['ladder.rungs[1]', 'root.x', 'teams[1]'], (s) => names[s]!)).toBe('Edited the ladder, the tree and the teams (3 places)');
    expect(describeChange([], (s) => s)).toBe('Saved without changes');
  });
});
