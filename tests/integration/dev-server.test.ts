import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { expect, it } from 'vitest';
import { freePort, openSocket, type App } from '../support/app';

it('`npm run dev` serves the same websocket endpoints through the integration hook', async () => {
  const dir = mkdtempSync(join(tmpdir(), 'rungwise-dev-'));
  const port = await freePort();
  const child = spawn(process.execPath, [resolve('node_modules/astro/astro.js'), 'dev'], {
    env: { ...process.env, NODE_ENV: 'development', PORT: String(port), HOST: '127.0.0.1', DATABASE_URL: join(dir, 'dev.db'), RUNGWISE_SEED: 'off' },
    stdio: 'ignore',
  });
  try {
    const url = `http://127.0.0.1:${port}`;
    let health: Response | null = null;
    for (let i = 0; i < 120 && !health?.ok; i++) {
      health = await fetch(`${url}/api/health`).catch(() => null);
      if (!health?.ok) await new Promise((r) => setTimeout(r, 500));
    }
    expect(await health!.json()).toMatchObject({ status: 'ok', mail: { mode: 'sink' } });
    await expect(openSocket({ port, url } as App, '/ws/exercise/x', '')).rejects.toMatchObject({ status: 401 });
  } finally {
    child.kill('SIGTERM');
    rmSync(dir, { recursive: true, force: true });
  }
});
