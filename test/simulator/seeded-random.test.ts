import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../simulator/seeded-random';

describe('SeededRandom', () => {
  it('repeats its sequence for the same seed and differs for another', () => {
    const take = (r: SeededRandom) => Array.from({ length: 20 }, () => r.next());
    expect(take(new SeededRandom(42))).toEqual(take(new SeededRandom(42)));
    expect(take(new SeededRandom(42))).not.toEqual(take(new SeededRandom(43)));
    expect(take(SeededRandom.fromText('12AX7#1'))).not.toEqual(
      take(SeededRandom.fromText('12AX7#2')),
    );
  });

  it('gives uniform deviates in [0, 1) and standard normal gaussians', () => {
    const r = new SeededRandom(7);
    const u = Array.from({ length: 20000 }, () => r.next());
    expect(Math.min(...u)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...u)).toBeLessThan(1);
    expect(u.reduce((a, x) => a + x, 0) / u.length).toBeCloseTo(0.5, 1);
    const g = Array.from({ length: 20000 }, () => r.gaussian());
    const mean = g.reduce((a, x) => a + x, 0) / g.length;
    const variance = g.reduce((a, x) => a + (x - mean) ** 2, 0) / g.length;
    expect(mean).toBeCloseTo(0, 1);
    expect(variance).toBeCloseTo(1, 1);
  });
});
