/**
 * Numbers in the model: a payoff or probability is a finite JSON number or an exact
 * string such as "1/3", "-7/2" or "0.25". Solvers work either in floats or in exact
 * rationals (fraction.js on BigInt); the Field interface lets one algorithm serve both.
 */
import Fraction from 'fraction.js';

export type Num = number | string;
export { Fraction };

/** Pattern of an exact value: an integer, a decimal, or a fraction of integers. */
export const EXACT_PATTERN = /^-?(\d+\/[1-9]\d*|\d+(\.\d+)?)$/;

const pow10 = (k: number) => 10n ** BigInt(k);

/** Exact rational of a decimal text such as "-12.5e-3" (JavaScript's own number spelling). */
function decimalToFraction(text: string): Fraction {
  const m = /^(-?)(\d+)(?:\.(\d+))?(?:e([+-]?\d+))?$/i.exec(text);
  if (!m) throw new Error(`not a decimal: ${text}`);
  const [, sign, whole, frac = '', exp = '0'] = m;
  let n = BigInt(whole + frac);
  let d = pow10(frac.length);
  const e = Number(exp);
  if (e >= 0) n *= pow10(e);
  else d *= pow10(-e);
  return new Fraction(sign ? -n : n, d);
}

/** Exact value of a model number; null when it is not a finite number or exact string. */
export function parseExact(value: Num): Fraction | null {
  if (typeof value === 'number') {
    return Number.isFinite(value) ? decimalToFraction(String(value)) : null;
  }
  const text = value.trim();
  if (!EXACT_PATTERN.test(text)) return null;
  const slash = text.indexOf('/');
  if (slash < 0) return decimalToFraction(text);
  return new Fraction(BigInt(text.slice(0, slash)), BigInt(text.slice(slash + 1)));
}

export function toExact(value: Num): Fraction {
  const f = parseExact(value);
  if (!f) throw new Error(`not a finite number or exact value: ${JSON.stringify(value)}`);
  return f;
}

export function toFloat(value: Num): number {
  return typeof value === 'number' ? value : toExact(value).valueOf();
}

/** "7/3", "-2", "1/4": the spelling every exact result uses. */
export function formatExact(f: Fraction): string {
  return f.toFraction();
}

/**
 * The arithmetic a solver needs. `cmp` is exact for rationals and uses a relative
 * tolerance for floats, so that ties in float mode are the ties an author meant.
 */
export interface Field<T> {
  readonly exact: boolean;
  readonly zero: T;
  readonly one: T;
  from(value: Num): T;
  fromNumber(value: number): T;
  add(a: T, b: T): T;
  sub(a: T, b: T): T;
  mul(a: T, b: T): T;
  div(a: T, b: T): T;
  neg(a: T): T;
  cmp(a: T, b: T): -1 | 0 | 1;
  toNumber(a: T): number;
  /** Exact spelling in exact mode; undefined in float mode. */
  format(a: T): string | undefined;
}

export const FLOAT_TOLERANCE = 1e-9;

export function floatCmp(a: number, b: number): -1 | 0 | 1 {
  const scale = Math.max(1, Math.abs(a), Math.abs(b));
  if (Math.abs(a - b) <= FLOAT_TOLERANCE * scale) return 0;
  return a < b ? -1 : 1;
}

export const floatField: Field<number> = {
  exact: false,
  zero: 0,
  one: 1,
  from: toFloat,
  fromNumber: (v) => v,
  add: (a, b) => a + b,
  sub: (a, b) => a - b,
  mul: (a, b) => a * b,
  div: (a, b) => a / b,
  neg: (a) => -a,
  cmp: floatCmp,
  toNumber: (a) => a,
  format: () => undefined,
};

const FRACTION_ZERO = new Fraction(0);
const FRACTION_ONE = new Fraction(1);

export const exactField: Field<Fraction> = {
  exact: true,
  zero: FRACTION_ZERO,
  one: FRACTION_ONE,
  from: toExact,
  fromNumber: (v) => toExact(v),
  add: (a, b) => a.add(b),
  sub: (a, b) => a.sub(b),
  mul: (a, b) => a.mul(b),
  div: (a, b) => a.div(b),
  neg: (a) => a.neg(),
  cmp: (a, b) => {
    const c = a.compare(b);
    return c < 0 ? -1 : c > 0 ? 1 : 0;
  },
  toNumber: (a) => a.valueOf(),
  format: formatExact,
};
