/** The per-connection message limit (server/socket-guard.ts): a token bucket, by the clock it is given. */
import { describe, expect, it } from 'vitest';
import { CLOSE_AFTER_DROPS, TokenBucket } from '../../server/socket-guard';

const limit = { burst: 10, perSecond: 5 };

function takes(bucket: TokenBucket, count: number, at: number) {
  return Array.from({ length: count }, () => bucket.take(at));
}

describe('the message limit', () => {
  it('delivers a whole burst at once, then drops', () => {
    const bucket = new TokenBucket(limit, 0);
    expect(takes(bucket, 10, 0)).toEqual(Array(10).fill('deliver'));
    expect(bucket.take(0)).toBe('drop');
  });

  it('refills at the rate, never above the burst', () => {
    const bucket = new TokenBucket(limit, 0);
    takes(bucket, 10, 0);
    expect(takes(bucket, 2, 400)).toEqual(['deliver', 'deliver']); // 0.4 s at 5 a second
    expect(bucket.take(400)).toBe('drop');
    expect(takes(bucket, 11, 60_000).filter((v) => v === 'deliver')).toHaveLength(10);
  });

  it('never limits a sender that keeps to the rate, however long', () => {
    const bucket = new TokenBucket(limit, 0);
    for (let t = 0; t < 600_000; t += 200) expect(bucket.take(t)).toBe('deliver');
  });

  it('closes a sender that keeps flooding, and forgives one that waits for a full bucket', () => {
    const bucket = new TokenBucket(limit, 0);
    takes(bucket, 10, 0);
    expect(takes(bucket, CLOSE_AFTER_DROPS - 1, 0).every((v) => v === 'drop')).toBe(true);
    expect(bucket.take(2000)).toBe('deliver'); // full again after 2 s: the count of drops starts over
    takes(bucket, 9, 2000);
    expect(takes(bucket, CLOSE_AFTER_DROPS - 1, 2000).at(-1)).toBe('drop');
    expect(bucket.take(2000)).toBe('close');
  });

  it('counts drops across short pauses that do not refill the bucket', () => {
    const bucket = new TokenBucket(limit, 0);
    takes(bucket, 10, 0);
    const verdicts: string[] = [];
    for (let t = 0; verdicts.at(-1) !== 'close' && t < 10_000; t += 100) verdicts.push(...takes(bucket, 5, t));
    expect(verdicts).toContain('deliver');
    expect(verdicts.at(-1)).toBe('close');
  });
});
