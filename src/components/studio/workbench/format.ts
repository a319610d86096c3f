/** Number and text formatting shared by the workbench's tables and panels. */
import { EXACT_PATTERN, type Num } from '../../../lib/engine';

/** A value for people: at most three decimals, no trailing zeros. */
export function formatNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const rounded = Math.round(value * 1000) / 1000;
  return Object.is(rounded, -0) ? '0' : String(rounded);
}

export function formatPercent(p: number): string {
  return `${(p * 100).toFixed(p < 0.1 && p > 0 ? 1 : 0)}%`;
}

/** A number typed by the author: "3", "-1.5" or "2/3". Null when it is not one. */
export function parseNum(text: string): Num | null {
  const trimmed = text.trim();
  if (!EXACT_PATTERN.test(trimmed)) return null;
  if (trimmed.includes('/')) return trimmed;
  const n = Number(trimmed);
  return Number.isFinite(n) ? n : null;
}

export const NUM_HINT = 'a number such as 3, -1.5 or 2/3';

export function numText(value: Num | undefined): string {
  return value === undefined ? '' : String(value);
}

/** "7 nodes", "1 node". */
export function count(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;
}
