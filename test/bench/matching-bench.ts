// Matching benchmark: time to group pools of 200 and 1000 valves into quads, and the quality of
// the grouping against the best of many random-initialised local searches. Prints figures
// only; nothing here asserts a speed. Run with `npx tsx test/bench/matching-bench.ts`
// (add `--quick` for fewer restarts).
import type { CostMatrix } from '../../shared/matching/cost-matrix';
import { formGroups } from '../../shared/matching/form-groups';
import { groupValves } from '../../shared/matching/group-valves';
import { improvePartition } from '../../shared/matching/improve-partition';
import { resolveCriteria, type ResolvedCriteria } from '../../shared/matching/matching-criteria';
import { prepareValves } from '../../shared/matching/match-valves';
import { extractFeatures, type ValveFeatures } from '../../shared/matching/valve-features';
import { distanceMatrix } from '../../shared/matching/valve-distance';
import {
  individual,
  PLAN_EL34,
  publishedLaw,
  sampleFamily,
  seededRandom,
  shuffled,
  surfaceValve,
  type PoolValve,
} from '../shared/matching/valve-pool';

const quick = process.argv.includes('--quick');
const RUNS = 3;

const resolved = resolveCriteria({
  valveType: 'EL34',
  operatingPoints: [
    { label: 'idle', vaVolts: 250, vg2Volts: 250, vg1Volts: -17.5 },
    { label: 'drive', vaVolts: 100, vg2Volts: 250, vg1Volts: -10 },
  ],
  window: { vaMinVolts: 50, vaMaxVolts: 250, iaMinMilliamps: 20, iaMaxMilliamps: 150 },
  groupSize: 4,
});
if (!resolved.ok) throw new Error(resolved.reason);
const criteria: ResolvedCriteria = resolved.criteria;

/**
 * A box of EL34s from the published Koren set (Glass Audio 8(5), 1996): emission ±15 %, MU
 * ±8 %, KP ±20 %, EX ±3 % (uniform), so the valves differ in more than one way.
 */
function pool(size: number, seed: number): PoolValve[] {
  const random = seededRandom(seed);
  const base = publishedLaw('EL34');
  const u = () => 2 * random() - 1;
  return Array.from({ length: size }, (_, i) => {
    const law = individual(base, 1 + 0.15 * u(), 1 + 0.08 * u());
    law.params.kp *= 1 + 0.2 * u();
    law.params.ex *= 1 + 0.03 * u();
    return { id: `el34-${String(i).padStart(4, '0')}`, law };
  });
}

function features(valves: PoolValve[]): ValveFeatures[] {
  return valves.map((v) => {
    const f = extractFeatures(surfaceValve(v), criteria);
    if (!f.ok) throw new Error(f.reason);
    return f.features;
  });
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

function time<T>(f: () => T): [T, number] {
  const t0 = performance.now();
  const out = f();
  return [out, performance.now() - t0];
}

function randomStart(costs: CostMatrix, seed: number): { total: number; ms: number } {
  const order = shuffled(
    Array.from({ length: costs.size }, (_, i) => i),
    seededRandom(seed),
  );
  const whole = Math.floor(costs.size / 4) * 4;
  const groups: number[][] = [];
  for (let i = 0; i < whole; i += 4) groups.push(order.slice(i, i + 4));
  const [p, ms] = time(() => improvePartition(costs, { groups, leftOver: order.slice(whole) }));
  return { total: costs.partitionCost(p.groups), ms };
}

const fmt = (x: number, digits = 1) => x.toFixed(digits);
const rows: string[][] = [];
const header = [
  'valves',
  'matrix ms',
  'quads ms',
  'groupValves ms',
  'total score %',
  'acceptable quads',
  'restarts',
  'best restart %',
  'median restart %',
  'restart ms (median)',
  'ours vs best restart',
];

// Feature extraction through the analysis package (sampled families), per valve.
{
  const sample = pool(20, 7).map((v, i) => ({
    id: v.id,
    label: v.id,
    family: sampleFamily(v.law, { ...PLAN_EL34, noiseFraction: 0.0005 }, i + 1),
  }));
  const times: number[] = [];
  for (let r = 0; r < RUNS; r++) times.push(time(() => prepareValves(sample, criteria))[1] / 20);
  console.log(
    `feature extraction from a sampled EL34 family (analysis package): ` +
      `${fmt(median(times))} ms per valve (median of ${RUNS} runs of 20 valves)`,
  );
}

for (const size of [200, 1000]) {
  const valves = features(pool(size, size));
  const matrixMs: number[] = [];
  const quadsMs: number[] = [];
  const groupMs: number[] = [];
  let costs: CostMatrix | null = null;
  let total = 0;
  let acceptable = 0;
  for (let r = 0; r < RUNS; r++) {
    const [m, mMs] = time(() => distanceMatrix(valves, criteria));
    const [p, qMs] = time(() => formGroups(m, 4));
    const [result, gMs] = time(() => groupValves(valves, criteria));
    if (!result.ok) throw new Error(result.reason);
    matrixMs.push(mMs);
    quadsMs.push(qMs);
    groupMs.push(gMs);
    costs = m;
    total = m.partitionCost(p.groups);
    acceptable = result.groups.filter((g) => g.acceptable).length;
  }
  const restarts = quick ? 5 : size <= 200 ? 50 : 20;
  const random = Array.from({ length: restarts }, (_, s) => randomStart(costs!, 1000 + s));
  const best = Math.min(...random.map((x) => x.total));
  rows.push([
    String(size),
    fmt(median(matrixMs), 0),
    fmt(median(quadsMs), 0),
    fmt(median(groupMs), 0),
    fmt(total),
    `${acceptable} of ${Math.floor(size / 4)}`,
    String(restarts),
    fmt(best),
    fmt(median(random.map((x) => x.total))),
    fmt(median(random.map((x) => x.ms)), 0),
    `${fmt((100 * (total - best)) / best, 2)} %`,
  ]);
}

const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
const line = (cells: string[]) => cells.map((x, c) => x.padStart(widths[c])).join('  ');
console.log(line(header));
for (const r of rows) console.log(line(r));
console.log(
  'quads: blossom pairs, blossom pairs of pairs, multi-start local search (see form-groups.ts);' +
    ' restarts: random quads improved by the same local search; score = sum over quads of the' +
    ' largest pairwise distance, %; medians of ' +
    RUNS +
    ' runs.',
);
