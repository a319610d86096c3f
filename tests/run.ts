/**
 * `npm test`: the unit, integration and e2e groups in one vitest run.
 * Fails at once with the install command when Chromium is missing, builds the
 * app when stale, and leaves vitest's JSON results in test-results/.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { buildIfNeeded } from '../server/build';
import { CHROMIUM } from './support/chromium';

if (!existsSync(CHROMIUM)) {
  console.error(`The e2e tests need Chromium at ${CHROMIUM}. Install it with: apt-get install -y chromium`);
  process.exit(1);
}
buildIfNeeded();
mkdirSync('test-results', { recursive: true });
const vitest = spawnSync(
  process.execPath,
  ['node_modules/vitest/vitest.mjs', 'run', '--reporter=default', '--reporter=json', '--outputFile.json=test-results/vitest.json', ...process.argv.slice(2)],
  { stdio: 'inherit' },
);
process.exit(vitest.status ?? 1);
