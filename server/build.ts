/** Build the Astro app when the sources are newer than the last build. */
import { execFileSync } from 'node:child_process';
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

const SOURCES = ['src', 'public', 'astro.config.mjs', 'package-lock.json'];

export const distDir = () => resolve(process.env.RUNGWISE_DIST ?? 'dist');

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return readdirSync(path).reduce((latest, name) => Math.max(latest, newestMtime(join(path, name))), stat.mtimeMs);
}

export function buildIfNeeded(): void {
  const stamp = resolve(distDir(), '.built');
  const built = existsSync(stamp) ? statSync(stamp).mtimeMs : 0;
  if (built > Math.max(...SOURCES.map((s) => newestMtime(resolve(s))))) return;
  console.log('[rungwise] building the app (first start or changed sources)...');
  // A production build, whatever the caller's NODE_ENV (vitest sets "test", which would bundle React's dev JSX).
  execFileSync(process.execPath, [resolve('node_modules/astro/astro.js'), 'build'], {
    stdio: 'inherit',
    env: { ...process.env, NODE_ENV: 'production' },
  });
  writeFileSync(stamp, new Date().toISOString());
}
