// Analysis benchmark: time to build the interpolant of a 12-curve x 200-point anode family,
// to answer a grid of operating-point queries on it, and to fit a Koren model, as medians of
// repeated runs. Prints figures only; nothing here asserts a speed.
// Run with `npx tsx test/bench/analysis-bench.ts`.
import { buildAnodeFamily } from '../../shared/analysis/anode-family';
import { fitKorenModel } from '../../shared/analysis/koren-fit';
import type { KorenModel } from '../../shared/analysis/koren-model';
import { analyseLoadLine } from '../../shared/analysis/load-line';
import { transferCurve } from '../../shared/analysis/transfer-curve';
import type { SweepPoint } from '../../shared/domain/sweep';
import { findValveType } from '../../shared/catalog/valve-types';
import {
  gaussian,
  korenLaw,
  sampleFamily,
  seededRandom,
  type SamplingPlan,
} from '../shared/analysis/family-sampler';

const RUNS = 15;
const FIT_RUNS = 7;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

function time(runs: number, work: () => unknown): number {
  work(); // warm-up: compile the code paths first
  const ms: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    work();
    ms.push(performance.now() - t0);
  }
  return median(ms);
}

/**
 * Exactly `count` readings per curve, Va from 0 to vaMax unevenly spaced (each step 70-130 % of
 * the mean), no limits, optional tracer noise (sigma 0.2 % of full scale, 12-bit over twice it).
 */
function family(
  model: KorenModel,
  vg1Volts: number[],
  vaMax: number,
  count: number,
  noisy: boolean,
): SweepPoint[] {
  const random = seededRandom(7);
  const law = korenLaw(model);
  const full = law(vaMax, 0, 0).ia;
  const lsb = (2 * full) / 4096;
  const points: SweepPoint[] = [];
  vg1Volts.forEach((vg1, curve) => {
    for (let i = 0; i < count; i++) {
      const va =
        i === 0 ? 0 : Math.min(vaMax, (vaMax * (i + 0.3 * (random() - 0.5))) / (count - 1));
      let ia = law(va, vg1, 0).ia;
      if (noisy) ia = Math.max(0, Math.round((ia + 0.002 * full * gaussian(random)) / lsb) * lsb);
      points.push({
        seq: points.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: 0,
        iaMilliamps: ia,
        ig2Milliamps: 0,
      });
    }
  });
  return points;
}

const rows: { task: string; size: string; medianMs: number }[] = [];

const twelveAx7 = findValveType('12AX7')?.model as KorenModel;
const el34 = findValveType('EL34')?.model as KorenModel;
const grid12 = Array.from({ length: 12 }, (_, i) => -0.25 * i);
for (const noisy of [false, true]) {
  const label = noisy ? 'noisy' : 'noiseless';
  const points = family(twelveAx7, grid12, 300, 200, noisy);
  const perCurve = new Map<number, number>();
  for (const p of points) perCurve.set(p.curve, (perCurve.get(p.curve) ?? 0) + 1);
  const counts = new Set(perCurve.values());
  const size = `12 curves x ${[...counts].join('/')} points (${label})`;
  rows.push({
    task: 'build interpolant',
    size,
    medianMs: time(RUNS, () => buildAnodeFamily(points)),
  });
  const built = buildAnodeFamily(points);
  if (!built.ok) throw new Error(built.reason);
  const f = built.family;
  const grid: [number, number][] = [];
  for (let i = 0; i < 20; i++)
    for (let j = 0; j < 20; j++) grid.push([30 + i * 13, -2.75 + j * 0.14]);
  const queries = time(RUNS, () => grid.map(([va, vg]) => f.operatingPoint(va, vg)));
  rows.push({ task: '400 operating-point queries (20 x 20 grid)', size, medianMs: queries });
  rows.push({
    task: 'build + 400 queries',
    size,
    medianMs: time(RUNS, () => {
      const b = buildAnodeFamily(points);
      if (b.ok) for (const [va, vg] of grid) b.family.operatingPoint(va, vg);
    }),
  });
  rows.push({
    task: 'transfer curve, 41 points',
    size,
    medianMs: time(RUNS, () => transferCurve(f, 200, 41)),
  });
  rows.push({
    task: 'load line with 5-point swing',
    size,
    medianMs: time(RUNS, () =>
      analyseLoadLine(
        f,
        { kind: 'resistive', supplyVolts: 300, loadKiloohms: 100 },
        { kind: 'cathode', cathodeKiloohms: 1.5 },
        { gridSwingPeakVolts: 1 },
      ),
    ),
  });
}

// Fits on tracer-like families (limits on): noisy, from the published set.
const fitPlans: [string, KorenModel, SamplingPlan][] = [
  [
    '12AX7 triode',
    twelveAx7,
    {
      vg1Volts: Array.from({ length: 13 }, (_, i) => -0.25 * i),
      vaMaxVolts: 300,
      vaStepVolts: 5,
      iaMaxMilliamps: 3,
      paMaxWatts: 0.75,
      noise: 'tracer',
    },
  ],
  [
    'EL34 pentode',
    el34,
    {
      vg1Volts: Array.from({ length: 12 }, (_, i) => -2.5 * i),
      vg2Volts: 250,
      vaMaxVolts: 500,
      vaStepVolts: 8,
      iaMaxMilliamps: 250,
      paMaxWatts: 18.75,
      noise: 'tracer',
    },
  ],
];
for (const [name, model, plan] of fitPlans) {
  const points = sampleFamily(korenLaw(model), plan, 3);
  const fit = fitKorenModel(points, model);
  const note = fit.ok
    ? `, RMS ${fit.rmsErrorPercent.toFixed(2)} %, ${fit.iterations} iterations`
    : '';
  rows.push({
    task: `Koren fit, ${name}`,
    size: `${points.length} readings (noisy${note})`,
    medianMs: time(FIT_RUNS, () => fitKorenModel(points, model)),
  });
}
// The 12 x 200 family itself.
{
  const points = family(twelveAx7, grid12, 300, 200, true);
  rows.push({
    task: 'Koren fit, 12AX7 triode',
    size: `${points.length} readings (12 x 200, noisy)`,
    medianMs: time(FIT_RUNS, () => fitKorenModel(points, twelveAx7)),
  });
}

const w1 = Math.max(...rows.map((r) => r.task.length), 4);
const w2 = Math.max(...rows.map((r) => r.size.length), 4);
console.log(
  `Analysis benchmark, medians of ${RUNS} runs (${FIT_RUNS} for fits), Node ${process.version}`,
);
console.log(`${'task'.padEnd(w1)}  ${'size'.padEnd(w2)}  median ms`);
for (const r of rows)
  console.log(`${r.task.padEnd(w1)}  ${r.size.padEnd(w2)}  ${r.medianMs.toFixed(1).padStart(9)}`);
