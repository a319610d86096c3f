/**
 * npm run solve -- FILE [--exact] [--qre LAMBDA] [--all]
 *
 * FILE is a scenario document or the plain tree format (see src/lib/engine/plain.ts).
 * Prints JSON: {"method", "count", "plays", "distinctPayoffs", "equilibria": [{"path",
 * "payoffs", "choices"}]} (count: strategy profiles; plays: distinct equilibrium plays;
 * distinctPayoffs: how many different expected payoff vectors those plays have) and,
 * with --qre, the logit QRE behaviour at every information set. --exact computes in
 * rational arithmetic (payoffs and probabilities printed as exact strings such as "7/3");
 * --all lists every equilibrium found (up to 1000) instead of the first.
 * Exit codes: 0 solved, 2 bad command line or bad file (the message names the fault),
 * 1 the file is valid but cannot be solved (the message says why).
 */
import { readFileSync } from 'node:fs';
import { logitQre, parsePlainGame, solveSubgamePerfect, type Equilibrium, type Game } from '../src/lib/engine';
import { parseScenario, scenarioGame } from '../src/lib/scenario';

const USAGE = 'usage: npm run solve -- FILE [--exact] [--qre LAMBDA] [--all]';
const MAX_LISTED = 1000;

interface Options {
  file: string;
  exact: boolean;
  all: boolean;
  qre?: number;
}

class BadInput extends Error {}

function parseArgs(args: string[]): Options {
  let file: string | undefined;
  let exact = false;
  let all = false;
  let qre: number | undefined;
  for (let i = 0; i < args.length; i++) {
    const arg = args[i]!;
    if (arg === '--exact') exact = true;
    else if (arg === '--all') all = true;
    else if (arg === '--qre') {
      const text = args[++i];
      const value = Number(text);
      if (text === undefined || text.trim() === '' || !Number.isFinite(value) || value < 0) {
        throw new BadInput(`--qre needs a lambda, a finite number >= 0 (got ${text === undefined ? 'nothing' : JSON.stringify(text)})`);
      }
      qre = value;
    } else if (arg.startsWith('--')) throw new BadInput(`unknown option ${arg}`);
    else if (file === undefined) file = arg;
    else throw new BadInput(`only one FILE may be given (got ${file} and ${arg})`);
  }
  if (file === undefined) throw new BadInput('no FILE given');
  return { file, exact, all, ...(qre !== undefined ? { qre } : {}) };
}

function loadGame(file: string): Game {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    throw new BadInput(`${file}: cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new BadInput(`${file}: not valid JSON (${(e as Error).message})`);
  }
  const isScenario = typeof json === 'object' && json !== null && 'format' in json;
  if (isScenario) {
    const parsed = parseScenario(json);
    if (!parsed.ok) throw new BadInput(parsed.faults.map((f) => `${file}: ${f.path}: ${f.message}`).join('\n'));
    return scenarioGame(parsed.scenario);
  }
  const parsed = parsePlainGame(json);
  if (!parsed.ok) throw new BadInput(parsed.faults.map((f) => `${file}: ${f.path}: ${f.message}`).join('\n'));
  return parsed.game;
}

function printable(eq: Equilibrium, exact: boolean) {
  return {
    path: eq.path,
    payoffs: exact ? eq.payoffsExact! : eq.payoffs,
    choices: exact ? eq.choicesExact! : eq.choices,
  };
}

function main(args: string[]): number {
  let options: Options;
  let game: Game;
  try {
    options = parseArgs(args);
    game = loadGame(options.file);
  } catch (e) {
    if (!(e instanceof BadInput)) throw e;
    console.error(e.message);
    if (args.length === 0 || e.message.startsWith('no FILE') || e.message.startsWith('unknown option')) console.error(USAGE);
    return 2;
  }
  try {
    const result = solveSubgamePerfect(game, { exact: options.exact, maxListed: options.all ? MAX_LISTED : 1 });
    const output = {
      method: result.method,
      count: result.count,
      ...(result.countExact ? {} : { countIsLowerBound: true }),
      plays: result.plays,
      ...(result.playsExact ? {} : { playsIsLowerBound: true }),
      distinctPayoffs: result.distinctPayoffs,
      equilibria: result.equilibria.map((eq) => printable(eq, options.exact)),
      ...(options.qre !== undefined ? { qre: logitQre(game, { lambda: options.qre }) } : {}),
    };
    console.log(JSON.stringify(output, null, 2));
    return 0;
  } catch (e) {
    console.error(`${options.file}: ${(e as Error).message}`);
    return 1;
  }
}

process.exitCode = main(process.argv.slice(2));
