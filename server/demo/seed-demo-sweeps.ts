import { findValveType } from '../../shared/catalog/valve-types';
import { readingTrips } from '../../shared/domain/plan-check';
import type { HubDb } from '../db/database';
import { insertNewPoints, insertSweep } from '../sweeps/sweep.repository';
import { refreshSweepFigures } from '../valves/refresh-sweep-figures';
import { computeSweepFigures } from '../valves/sweep-figures';
import { DEMO_BENCHES } from './demo-data';
import { demoSweepPoints, type DemoSweep } from './demo-sweep-points';
import { DEMO_STOCK } from './demo-stock';

/**
 * Simulated individual (seed) behind a demo valve's sweep where it is not the valve's position
 * in the stock (1-based). Chosen so that KL-0001..0004 (12AX7) and KL-0009..0012 (EL34) are
 * within about 2 % of each other in Ia and gm at the reference point, KL-0013/0014 are a close
 * pair, and the rejected valves are weak. KL-0001 is Bench A's simulated valve (12AX7#1). Bench
 * B holds EL34#4, but that individual draws past the default plan's trip current on its Vg1 = 0
 * curve (the plan's curve limit and trip current are both 250 mA), so its record shows another.
 */
const SEEDS: Readonly<Record<string, number>> = {
  'KL-0002': 42,
  'KL-0003': 129,
  'KL-0004': 5,
  'KL-0005': 24,
  'KL-0006': 39,
  'KL-0009': 11,
  'KL-0010': 163,
  'KL-0011': 23,
  'KL-0012': 30,
  'KL-0013': 16,
  'KL-0014': 123,
  'KL-0015': 197,
  'KL-0016': 2,
};

/** Days between one demo sweep and the next, going back from now. */
const DAYS_BETWEEN_SWEEPS = 1.3;
/** Time one reading of the simulated tracer takes (settling plus conversion), ms. */
const READING_MS = 12;

/** The simulated individual "TYPE#SEED" behind the demo valve at `index` of the stock. */
export function demoSweepValveSpec(index: number): string {
  const v = DEMO_STOCK[index];
  return `${v.type}#${SEEDS[v.label] ?? index + 1}`;
}

/** Other individuals tried, this far apart in seed, when one would trip the plan. */
const SEED_STRIDE = 1000;
/** Individuals tried for one demo valve before it is left without a sweep. */
const MAX_TRIES = 200;

/*
 * A reading past the trip would have ended the run with 'limit' (some EL34s draw past the
 * default plan's trip current on the Vg1 = 0 curve): such an individual is passed over for the
 * next one, so each demo sweep is one a tracer could have completed. Individuals whose curves
 * next to the type's reference point stop at the plan's dissipation limit too far short of it
 * for the analysis to carry them on (more than 15 % of Va; strong EL34s and 6L6GCs, whose
 * reference points sit at the anode rating) leave a record without figures; the demo prefers
 * the next individual whose figures it gets, so that every demo valve has a grade, and keeps
 * the first complete one where none does.
 */
function completeSweep(index: number): { spec: string; sweep: DemoSweep } | null {
  const [type, seedText] = demoSweepValveSpec(index).split('#');
  const reference = findValveType(type)?.operatingPoints[0];
  let fallback: { spec: string; sweep: DemoSweep } | null = null;
  for (let k = 0; k < MAX_TRIES; k++) {
    const spec = `${type}#${Number(seedText) + k * SEED_STRIDE}`;
    const sweep = demoSweepPoints(spec);
    if (sweep.points.some((p) => readingTrips(sweep.plan, p.vaVolts, p.iaMilliamps))) continue;
    if (!reference) return { spec, sweep };
    if (computeSweepFigures(sweep.plan, sweep.points, reference).refusal === null) {
      return { spec, sweep };
    }
    fallback ??= { spec, sweep };
  }
  return fallback;
}

/** Minutes between a double triode's section-1 and section-2 sweeps (a socket switch apart). */
const SECTION_2_AFTER_MINUTES = 6;

/**
 * Gives each demo valve of a type the simulator models one complete anode-family sweep of its
 * own simulated individual, run on the first demo bench by the demo technician on days spread
 * over the past weeks, and computes its figures so the valve has a grade. Call right after the
 * demo stock is created; returns the number of sweeps added.
 */
export async function seedDemoSweeps(db: HubDb, nowMs = Date.now()): Promise<number> {
  return db.transaction().execute(async (trx) => {
    const bench = await trx
      .selectFrom('benches')
      .select('id')
      .where('name', '=', DEMO_BENCHES[0].name)
      .executeTakeFirst();
    const tech = await trx
      .selectFrom('users')
      .select('id')
      .where('username', '=', 'tech')
      .executeTakeFirst();
    if (!bench || !tech) return 0;
    let added = 0;
    for (let i = 0; i < DEMO_STOCK.length; i++) {
      const stock = DEMO_STOCK[i];
      if (!findValveType(stock.type)?.model) continue;
      const valve = await trx
        .selectFrom('valves')
        .select('id')
        .where('label', '=', stock.label)
        .executeTakeFirst();
      if (!valve) continue;
      const found = completeSweep(i);
      if (!found) continue;
      const type = findValveType(stock.type)!;
      const baseMs =
        nowMs - (DEMO_STOCK.length - i) * DAYS_BETWEEN_SWEEPS * 86_400_000 + (i % 5) * 3_600_000;
      // Double triodes get section 2 swept as well, on the same individual, minutes later.
      const runs: [DemoSweep, number][] = [[found.sweep, baseMs]];
      if (type.sections >= 2) {
        const second = demoSweepPoints(found.spec, 2);
        if (!second.points.some((p) => readingTrips(second.plan, p.vaVolts, p.iaMilliamps))) {
          runs.push([second, baseMs + SECTION_2_AFTER_MINUTES * 60_000]);
        }
      }
      for (const [{ plan, points }, startedMs] of runs) {
        const createdMs = startedMs - 5_000;
        const endedMs = startedMs + plan.warmupSeconds * 1000 + points.length * READING_MS;
        const sweepId = await insertSweep(trx, {
          bench_id: bench.id,
          valve_type: stock.type,
          valve_label: stock.label,
          plan_json: JSON.stringify(plan),
          operator_id: tech.id,
          status: 'complete',
          end_reason: 'complete',
          end_message: null,
          override_by: null,
          reported_count: points.length,
          created_at: new Date(createdMs).toISOString(),
          started_at: new Date(startedMs).toISOString(),
          ended_at: new Date(endedMs).toISOString(),
          valve_id: valve.id,
        });
        await insertNewPoints(trx, sweepId, points);
        await refreshSweepFigures(trx, sweepId);
        added++;
      }
    }
    return added;
  });
}
