/**
 * Small dense linear systems over a Field: Gaussian elimination with pivoting on the
 * largest entry (floats) or any non-zero entry (exact).
 */
import type { Field } from './numbers';

/**
 * The unique solution of M z = rhs (M has rows.length equations and `unknowns` columns),
 * or null when the system has no solution or more than one.
 */
export function solveUnique<T>(field: Field<T>, rows: T[][], rhs: T[], unknowns: number): T[] | null {
  const m = rows.map((row, r) => [...row, rhs[r]!]);
  const pivots: number[] = [];
  let r = 0;
  for (let c = 0; c < unknowns && r < m.length; c++) {
    let best = -1;
    for (let k = r; k < m.length; k++) {
      if (field.cmp(m[k]![c]!, field.zero) === 0) continue;
      if (best < 0 || (!field.exact && Math.abs(field.toNumber(m[k]![c]!)) > Math.abs(field.toNumber(m[best]![c]!)))) best = k;
      if (field.exact) break;
    }
    if (best < 0) return null;
    [m[r], m[best]] = [m[best]!, m[r]!];
    const pivotRow = m[r]!;
    const pivot = pivotRow[c]!;
    for (let k = 0; k < m.length; k++) {
      if (k === r) continue;
      const row = m[k]!;
      const factor = row[c]!;
      if (field.cmp(factor, field.zero) === 0) continue;
      const f = field.div(factor, pivot);
      for (let j = c; j <= unknowns; j++) row[j] = field.sub(row[j]!, field.mul(f, pivotRow[j]!));
    }
    pivots.push(c);
    r++;
  }
  if (pivots.length < unknowns) return null;
  for (let k = r; k < m.length; k++) if (field.cmp(m[k]![unknowns]!, field.zero) !== 0) return null;
  return pivots.map((c, i) => field.div(m[i]![unknowns]!, m[i]![c]!));
}
