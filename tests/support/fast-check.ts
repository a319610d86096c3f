/**
 * Property tests draw their cases from one fixed seed, so that a run on CI is the run a
 * developer repeats. To explore beyond it, run with FC_SEED=random (a fresh seed each
 * run, printed by fast-check with any counterexample) or FC_SEED=<number>.
 */
import fc from 'fast-check';

const setting = process.env.FC_SEED ?? '20261203';
if (setting !== 'random') {
  const seed = Number(setting);
  if (!Number.isInteger(seed)) throw new Error(`FC_SEED must be an integer or "random", not ${JSON.stringify(setting)}`);
  fc.configureGlobal({ seed });
}
