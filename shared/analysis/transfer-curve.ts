import type { SweepPoint } from '../domain/sweep';
import type { AnodeFamily } from './anode-family';
import { CurveSet } from './curve-set';
import { estimate, type Estimate } from './estimate';
import { groupCurves } from './group-curves';
import { formatNumber, refuse, type Refusal } from './refusal';
import { SmoothedCurve } from './smoothed-curve';

/** One point of a derived transfer curve. */
export interface TransferPoint {
  /** Grid voltage, V. */
  vg1Volts: number;
  /** Anode current, mA. */
  iaMilliamps: Estimate;
  /** Mutual conductance, µS. */
  gmMicrosiemens: Estimate;
}

/** Ia against Vg1 at one Va, derived from an anode family. */
export interface TransferCurve {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** The anode voltage, V. */
  vaVolts: number;
  /** Evenly spaced points over the measured grid span at that Va. */
  points: TransferPoint[];
  /** The measured curves' own (smoothed) values at that Va, for markers. */
  measured: { vg1Volts: number; iaMilliamps: number }[];
}

/**
 * The transfer curve at Va from an anode family: Ia and gm over the run of measured curves that
 * reach Va (the longest such run, at least three curves), in pointCount even steps of Vg1.
 */
export function transferCurve(
  family: AnodeFamily,
  vaVolts: number,
  pointCount = 41,
): TransferCurve | Refusal {
  const set = family.set;
  const samples = set.section(vaVolts);
  const run = longestRun(samples.map((s) => s !== null));
  if (!run || run.last - run.first + 1 < 3) {
    return refuse(
      `fewer than three measured curves reach Va ${formatNumber(vaVolts)} V side by side; ` +
        `a transfer curve needs at least three`,
    );
  }
  const lo = set.params[run.first];
  const hi = set.params[run.last];
  const points: TransferPoint[] = [];
  for (let n = 0; n < pointCount; n++) {
    const vg1 = lo + ((hi - lo) * n) / (pointCount - 1);
    const found = set.surfaceAt(vg1, samples);
    if (!found.ok) continue;
    const pt = found.point;
    points.push({
      vg1Volts: vg1,
      iaMilliamps: estimate(pt.y, pt.yUncertainty),
      gmMicrosiemens: estimate(1000 * pt.dp, 1000 * pt.dpUncertainty),
    });
  }
  const measured = [];
  for (let j = run.first; j <= run.last; j++) {
    measured.push({ vg1Volts: set.params[j], iaMilliamps: (samples[j] as { y: number }).y });
  }
  return { ok: true, vaVolts, points, measured };
}

/** One anode curve derived from transfer sweeps. */
export interface DerivedAnodeCurve {
  /** Grid voltage of the curve, V. */
  vg1Volts: number;
  /** Evenly spaced points over the Va span of the transfer sweeps that reach this Vg1. */
  points: { vaVolts: number; iaMilliamps: Estimate }[];
  /** The transfer sweeps' own (smoothed) values at this Vg1, one per sweep. */
  measured: { vaVolts: number; iaMilliamps: number }[];
}

/** Options for anodeFamilyFromTransfers. */
export interface TransferFamilyOptions {
  /** Grid voltages of the derived curves, V (default: eight steps over the common span). */
  vg1Volts?: number[];
  /** Points per derived curve (default 41). */
  pointsPerCurve?: number;
  /** Anode voltages closer than this are one sweep, V (default 2 % of their span, >= 0.02 V). */
  vaToleranceVolts?: number;
}

/**
 * An anode-family view from transfer sweeps at several Va (at least three): each sweep is
 * smoothed along Vg1, and at each chosen Vg1 the sweeps' values are interpolated across Va the
 * same way anode curves are interpolated across Vg1.
 */
export function anodeFamilyFromTransfers(
  points: readonly SweepPoint[],
  options: TransferFamilyOptions = {},
): { ok: true; curves: DerivedAnodeCurve[] } | Refusal {
  const groups = groupCurves(points, 'va', options.vaToleranceVolts);
  const params: number[] = [];
  const curves: SmoothedCurve[] = [];
  for (const g of groups) {
    const curve = SmoothedCurve.fit(g.xs, g.ys, g.zs);
    if (curve) {
      params.push(g.keyVolts);
      curves.push(curve);
    }
  }
  if (curves.length < 3) {
    return refuse(
      `an anode-family view needs transfer sweeps at three or more Va with four or more ` +
        `distinct Vg1 each; found ${curves.length}`,
    );
  }
  const set = new CurveSet(params, curves);
  const commonLo = Math.max(...curves.map((c) => c.min));
  const commonHi = Math.min(...curves.map((c) => c.max));
  const vg1s =
    options.vg1Volts ??
    Array.from({ length: 9 }, (_, n) => commonHi - ((commonHi - commonLo) * n) / 8);
  const count = options.pointsPerCurve ?? 41;
  const out: DerivedAnodeCurve[] = [];
  for (const vg1 of vg1s) {
    const samples = set.section(vg1);
    const run = longestRun(samples.map((s) => s !== null));
    if (!run || run.last - run.first + 1 < 3) continue;
    const lo = params[run.first];
    const hi = params[run.last];
    const pts = [];
    for (let n = 0; n < count; n++) {
      const va = lo + ((hi - lo) * n) / (count - 1);
      const found = set.surfaceAt(va, samples);
      if (found.ok)
        pts.push({ vaVolts: va, iaMilliamps: estimate(found.point.y, found.point.yUncertainty) });
    }
    const measured = [];
    for (let j = run.first; j <= run.last; j++) {
      measured.push({ vaVolts: params[j], iaMilliamps: (samples[j] as { y: number }).y });
    }
    out.push({ vg1Volts: vg1, points: pts, measured });
  }
  if (out.length === 0) {
    return refuse('no chosen Vg1 is reached by three or more of the transfer sweeps');
  }
  return { ok: true, curves: out };
}

/** The longest run of consecutive true entries. */
function longestRun(flags: boolean[]): { first: number; last: number } | null {
  let best: { first: number; last: number } | null = null;
  for (let i = 0; i < flags.length;) {
    if (!flags[i]) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < flags.length && flags[j + 1]) j++;
    if (!best || j - i > best.last - best.first) best = { first: i, last: j };
    i = j + 1;
  }
  return best;
}
