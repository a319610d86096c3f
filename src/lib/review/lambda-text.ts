/**
 * A fitted lambda as people should read it. At the top of the range searched the
 * likelihood has levelled off (any larger lambda explains the moves as well), so the
 * value is a lower bound, shown with "≥"; at 0 random play explains the moves best.
 */
import { LAMBDA_RANGE } from './engine';
import type { TeamFit } from './types';

export const LAMBDA_BOUND_NOTE = `“≥” marks a lambda at the top of the range searched (${LAMBDA_RANGE.toLocaleString('en')} over the payoff range): any larger lambda explains the moves as well, so read it as “at least”.`;

export function lambdaText(fit: Pick<TeamFit, 'lambda' | 'lambdaBound'>, places = 2): string {
  if (fit.lambda === null) return '—';
  const value = Number(fit.lambda.toFixed(places)).toString();
  return fit.lambdaBound === 'upper' ? `≥ ${value}` : value;
}

/** Whether any team's lambda needs LAMBDA_BOUND_NOTE beside it. */
export const anyAtUpperBound = (fits: Pick<TeamFit, 'lambdaBound'>[]) => fits.some((f) => f.lambdaBound === 'upper');
