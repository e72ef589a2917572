import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { runInNewContext } from 'node:vm';
import { describe, expect, it } from 'vitest';
import { minCostMatching } from '../../../shared/matching/min-cost-matching';
import { seededRandom } from './valve-pool';

/** Random points in the plane; the cost of a pair is their distance. */
function planeCosts(n: number, seed: number): (i: number, j: number) => number {
  const random = seededRandom(seed);
  const pts = Array.from({ length: n }, () => [random(), random()]);
  return (i, j) => Math.hypot(pts[i][0] - pts[j][0], pts[i][1] - pts[j][1]);
}

describe('minimum-cost matching', () => {
  it('pairs the two close couples of four points, not the crossing pairs', () => {
    const xs = [0, 0.1, 5, 5.1];
    const mate = minCostMatching(4, (i, j) => Math.abs(xs[i] - xs[j]));
    expect(Array.from(mate)).toEqual([1, 0, 3, 2]);
  });

  it('handles pools of none, one and two', () => {
    expect(Array.from(minCostMatching(0, () => 0))).toEqual([]);
    expect(Array.from(minCostMatching(1, () => 0))).toEqual([-1]);
    expect(Array.from(minCostMatching(2, () => 3))).toEqual([1, 0]);
  });

  it('is symmetric and leaves exactly one over in odd pools, exact or sparse', () => {
    for (const n of [7, 40, 41]) {
      for (const options of [{}, { exactLimit: 10, neighbours: 4 }]) {
        const mate = minCostMatching(n, planeCosts(n, n), options);
        expect(mate.filter((m) => m < 0).length).toBe(n % 2);
        mate.forEach((m, i) => m >= 0 && expect(mate[m]).toBe(i));
      }
    }
  });

  it('runs the blossom package in strict code once its stray assignments are declared', () => {
    // edmonds-blossom 1.0.0 assigns undeclared b, path and v; strict code (every ES-module
    // bundle) throws there. Evaluated strict in a fresh context it fails; with the three names
    // declared on the global object, as minCostMatching does, it runs.
    const require = createRequire(import.meta.url);
    const source = readFileSync(require.resolve('edmonds-blossom'), 'utf8');
    const strict =
      `'use strict'; const module = { exports: {} }; ${source};` + ' module.exports(edges, true);';
    const edges: [number, number, number][] = [];
    const cost = planeCosts(30, 5);
    for (let i = 0; i < 30; i++)
      for (let j = i + 1; j < 30; j++) edges.push([i, j, Math.round(1e6 * (2 - cost(i, j)))]);
    expect(() => runInNewContext(strict, { edges })).toThrow(/is not defined/);
    const mate = runInNewContext(strict, { edges, b: undefined, path: undefined, v: undefined });
    expect(mate).toHaveLength(30);
    minCostMatching(4, () => 1);
    for (const name of ['b', 'path', 'v']) expect(name in globalThis).toBe(true);
  });
});
