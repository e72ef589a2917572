import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SeqWatermark } from '../../../server/sweeps/seq-watermark';

/** The definition: highest n such that 0..n are all in the set. */
function contiguousPrefix(seqs: Iterable<number>): number {
  const set = new Set(seqs);
  let n = -1;
  while (set.has(n + 1)) n++;
  return n;
}

describe('SeqWatermark', () => {
  it('is -1 until seq 0 arrives', () => {
    const w = new SeqWatermark();
    w.add(1);
    w.add(2);
    expect(w.throughSeq).toBe(-1);
    w.add(0);
    expect(w.throughSeq).toBe(2);
  });

  it('equals the contiguous prefix after any order of arrivals, repeats included', () => {
    fc.assert(
      fc.property(fc.array(fc.nat({ max: 60 }), { maxLength: 200 }), (arrivals) => {
        const w = new SeqWatermark();
        const seen: number[] = [];
        for (const seq of arrivals) {
          const before = w.throughSeq;
          w.add(seq);
          seen.push(seq);
          expect(w.throughSeq).toBe(contiguousPrefix(seen));
          expect(w.throughSeq).toBeGreaterThanOrEqual(before);
        }
      }),
    );
  });

  it('starts from stored seqs given in any order', () => {
    expect(new SeqWatermark([3, 1, 0, 2, 7]).throughSeq).toBe(3);
  });
});
