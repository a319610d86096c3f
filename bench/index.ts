/**
 * `npm run bench`: the engine, Studio and report benchmarks one after another,
 * each in its own process so that none inherits another's warm caches or pools.
 * The live-exercise load test is separate (`npm run bench:live`).
 */
import { spawnSync } from 'node:child_process';

const BENCHES = ['bench/engine.ts', 'bench/studio.ts', 'bench/report.ts'];

let failed = 0;
for (const file of BENCHES) {
  console.log(`\n=== ${file} ===`);
  const run = spawnSync(process.execPath, ['--import', 'tsx', file], { stdio: 'inherit' });
  if (run.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
