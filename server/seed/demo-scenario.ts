/** The demo scenario file, read and checked like any import. No database here: benches and tests load the demo through it too. */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { parseScenario, type Scenario } from '../../src/lib/scenario';

export const DEMO_SCENARIO_FILE = resolve('scenarios/serrin-strait.json');

/** A demo with faults stops whoever loads it, with every fault listed. */
export function demoScenario(): Scenario {
  const parsed = parseScenario(JSON.parse(readFileSync(DEMO_SCENARIO_FILE, 'utf8')));
  if (!parsed.ok) {
    const faults = parsed.faults.map((f) => `  ${f.path}: ${f.message}`).join('\n');
    throw new Error(`The demo scenario ${DEMO_SCENARIO_FILE} is not valid:\n${faults}`);
  }
  return parsed.scenario;
}
