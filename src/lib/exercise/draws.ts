/**
 * The seeds of the server's chance draws. Each exercise has a 32-bit seed;
 * draw n uses its own seed (the exercise seed plus n times the golden-ratio
 * constant, the usual way to spread sequential seeds), and the engine's
 * drawChance takes the first number of mulberry32 with it. The move records
 * that seed and the number, so anyone can repeat the draw.
 */
import { randomInt } from 'node:crypto';

const GOLDEN = 0x9e3779b9;

export function newChanceSeed(): string {
  return String(randomInt(0, 2 ** 32 - 1));
}

export function drawSeed(exerciseSeed: string, index: number): number {
  return (Number(exerciseSeed) + Math.imul(index, GOLDEN)) >>> 0;
}
