import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'rungwise-solve-'));

function solve(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', ...args], { cwd: process.cwd() }, (error, stdout, stderr) => {
      resolve({ code: error ? (typeof error.code === 'number' ? error.code : 1) : 0, stdout, stderr });
    });
  });
}

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}

const tie = {
  teams: ['Blue', 'Red'],
  root: {
    team: 'Blue',
    actions: [
      { label: 'Probe', next: { team: 'Red', actions: [{ label: 'Yield', next: { payoffs: [1, 0] } }, { label: 'Resist', next: { payoffs: [2, 0] } }] } },
      { label: 'Wait', next: { chance: [{ label: 'Storm', p: '1/4', next: { payoffs: [2, 1] } }, { label: 'Calm', p: '3/4', next: { payoffs: [1, 1] } }] } },
    ],
  },
};

describe('npm run solve', () => {
  it('prints method, count and equilibria for the plain tree format, exactly with --exact, all with --all', async () => {
    const { code, stdout } = await solve([file('tie.json', tie), '--exact', '--all']);
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out.method).toBe('backward induction (exact)');
    // Red is indifferent; if Red yields, Blue waits (5/4 > 1); if Red resists, Blue probes (2 > 5/4).
    expect(out.count).toBe(2);
    // Both equilibria play differently (Wait, or Probe then Resist), worth (5/4, 1) and (2, 0).
    expect(out).toMatchObject({ plays: 2, distinctPayoffs: 2 });
    expect(out.playsIsLowerBound).toBeUndefined();
    expect(out.equilibria).toEqual([
      { path: ['Wait', 'Calm'], payoffs: ['5/4', '1'], choices: { n: { Probe: '0', Wait: '1' }, 'n.probe': { Yield: '1', Resist: '0' } } },
      { path: ['Probe', 'Resist'], payoffs: ['2', '0'], choices: { n: { Probe: '1', Wait: '0' }, 'n.probe': { Yield: '0', Resist: '1' } } },
    ]);
  });

  it('adds the QRE behaviour with --qre and lists only the first equilibrium by default', async () => {
    const { code, stdout } = await solve([file('tie2.json', tie), '--qre', '0']);
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out.equilibria).toHaveLength(1);
    expect(out.equilibria[0].payoffs).toEqual([1.25, 1]);
    expect(out.qre.behaviour).toEqual({ n: { Probe: 0.5, Wait: 0.5 }, 'n.probe': { Yield: 0.5, Resist: 0.5 } });
  });

  it('solves the demo scenario file', async () => {
    const { code, stdout } = await solve(['scenarios/serrin-strait.json']);
    expect(code).toBe(0);
    expect(JSON.parse(stdout).equilibria[0].path.at(-1)).toBe('Broker a settlement');
  });

  it('exits with code 2 and a message naming the fault for a bad file', async () => {
    const bad = { teams: ['Blue', 'Red'], root: { team: 'Blue', actions: [{ label: 'Go', next: { chance: [{ label: 'Storm', p: '1/4', next: { payoffs: [1, 2] } }] } }] } };
    const { code, stderr } = await solve([file('bad.json', bad)]);
    expect(code).toBe(2);
    expect(stderr).toContain('bad.json: root.actions[0].next.chance: at Go: probabilities sum to 1/4, not 1');
    const broken = await solve([file('broken.json', '{"teams": [')]);
    expect(broken.code).toBe(2);
    expect(broken.stderr).toContain('broken.json: not valid JSON');
    const missing = await solve([join(dir, 'absent.json')]);
    expect(missing).toMatchObject({ code: 2 });
    expect(missing.stderr).toContain('absent.json: cannot be read (ENOENT)');
    const option = await solve([file('ok.json', tie), '--qre', 'high']);
    expect(option.code).toBe(2);
    expect(option.stderr).toContain('--qre needs a lambda');
  });
});
