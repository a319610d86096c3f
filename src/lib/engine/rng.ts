/**
 * Seeded random numbers: mulberry32 (Tommy Ettinger's 32-bit generator, public domain),
 * small, fast and reproducible everywhere, so the server can log a seed and every draw.
 * Not for anything secret.
 */
export type Rng = () => number;

/** A generator of floats in [0, 1) from a 32-bit seed. */
export function mulberry32(seed: number): Rng {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
