import type { AnodeFamily } from './anode-family';
import { estimate, type Estimate } from './estimate';
import { findRoot } from './find-root';
import { polynomialAtZero } from './polynomial-at-zero';
import { formatNumber, refuse, type Refusal } from './refusal';

/**
 * Small-signal figures at one operating point of a measured family (IEEE Std 161-1971
 * definitions): gm = ∂Ia/∂Vg1 at constant Va, ra = ∂Va/∂Ia at constant Vg1,
 * mu = -∂Va/∂Vg1 at constant Ia. Units: V, mA, µS, kΩ.
 */
export interface OperatingPoint {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** Anode voltage of the point, V. */
  vaVolts: number;
  /** Grid voltage, V (uncertain when the point was asked by current). */
  vg1Volts: Estimate;
  /** Anode current, mA (exact when the point was asked by current). */
  iaMilliamps: Estimate;
  /** Screen current, mA (0 for triodes). */
  ig2Milliamps: number;
  /** Mutual conductance, from neighbouring curves at equal Va, µS. */
  gmMicrosiemens: Estimate;
  /** Anode resistance, from the local slope of the curve, kΩ; Infinity where flat within noise. */
  raKiloohms: Estimate;
  /**
   * Anode conductance 1/ra, µS. Its uncertainty stays meaningful where the slope is lost in
   * noise (nearly flat pentode curves), where ra's first-order uncertainty does not.
   */
  anodeConductanceMicrosiemens: Estimate;
  /** Amplification factor; from the Va shift between curves at equal Ia where they reach it. */
  mu: Estimate;
  /** How mu was found: 'va-shift' (direct) or 'gm-ra' (when the curves do not reach Ia). */
  muMethod: 'va-shift' | 'gm-ra';
  /** gm·ra, the cross-check of mu. */
  muFromGmRa: Estimate;
  /** Grid voltages of the curves that carried the result, V. */
  curvesVg1Volts: number[];
  /**
   * Largest distance a curve that carried the result was carried past its last reading to Va
   * (a curve the sweep cut at its dissipation or current limit), V; 0 when none was.
   */
  extendedVolts: number;
}

/**
 * How far past its end a cut curve may be carried to reach the asked Va, as a fraction of Va
 * (see CurveSet.sectionExtendingCut). A data-sheet point at the anode rating (EL34 250 V /
 * 100 mA = 25 W) lies on the dissipation limit the sweep's curves stop at, so the curve just
 * above it ends short. On simulated noisy sweeps of 30 individuals a type, figures at the
 * reference point were missing for 19 EL34s, 24 6L6GCs and 14 12AU7s without carrying cut curves
 * on, and for 9, 8 and 0 with 15 %; the carried ones' gm came within 0.9-1.4 % (median) and
 * 4.6 % (worst) of the law. With the noisier readings of the analysis tests (0.2 % of full
 * scale) they lean high, by up to 6 % on an EL34, inside stated uncertainties of 4-9 %.
 */
export const CUT_CURVE_EXTENSION = 0.15;

/** Analyses the family at (Va, Vg1). */
export function operatingPointAt(
  family: AnodeFamily,
  vaVolts: number,
  vg1Volts: number,
): OperatingPoint | Refusal {
  const set = family.set;
  let found = set.surfaceAt(vg1Volts, set.section(vaVolts));
  if (!found.ok && found.problem.kind === 'missing') {
    // The curve just above Vg1, or the one below, stopped short of Va: carry the curves up to
    // the first one above Vg1 on to Va, and only then (elsewhere the figures stay as measured).
    const above = set.params.find((p) => p >= vg1Volts) ?? vg1Volts;
    const extended = set.sectionExtendingCut(vaVolts, CUT_CURVE_EXTENSION * vaVolts, above);
    const retry = set.surfaceAt(vg1Volts, extended);
    if (retry.ok) found = retry;
  }
  if (!found.ok) return refuse(family.describe(found.problem, vaVolts, vg1Volts));
  const pt = found.point;
  const where = `at Va ${formatNumber(vaVolts)} V, Vg1 ${formatNumber(vg1Volts)} V`;
  if (!(pt.y > 3 * pt.yUncertainty)) {
    return refuse(
      `Ia ${where} is ${formatNumber(pt.y)} mA, within three uncertainties ` +
        `(${formatNumber(pt.yUncertainty)} mA) of zero: the valve is cut off there and gm, ra, ` +
        `mu are undefined`,
    );
  }
  if (!(pt.dp > 0)) {
    return refuse(`Ia ${where} does not rise with Vg1 in the measurements: gm is undefined there`);
  }
  const gm = pt.dp;
  const ga = pt.dx;
  const ra = ga > 0 ? 1 / ga : Number.POSITIVE_INFINITY;
  const raUnc = ga > 0 ? pt.dxUncertainty / (ga * ga) : Number.POSITIVE_INFINITY;
  const muGmRa = gm * ra;
  const muGmRaUnc =
    ga > 0 ? muGmRa * Math.hypot(pt.dpUncertainty / gm, pt.dxUncertainty / ga) : Infinity;
  const direct = ga > 0 ? muFromVaShift(family, vaVolts, vg1Volts, pt.y, ga, pt.lower) : null;
  return {
    ok: true,
    vaVolts,
    vg1Volts: estimate(vg1Volts, 0),
    iaMilliamps: estimate(pt.y, pt.yUncertainty),
    ig2Milliamps: pt.z,
    gmMicrosiemens: estimate(1000 * gm, 1000 * pt.dpUncertainty),
    raKiloohms: estimate(ra, raUnc),
    anodeConductanceMicrosiemens: estimate(1000 * ga, 1000 * pt.dxUncertainty),
    mu: direct ?? estimate(muGmRa, muGmRaUnc),
    muMethod: direct ? 'va-shift' : 'gm-ra',
    muFromGmRa: estimate(muGmRa, muGmRaUnc),
    curvesVg1Volts: pt.curves.map((j) => set.params[j]),
    extendedVolts: Math.max(0, ...pt.curves.map((j) => vaVolts - set.curves[j].max)),
  };
}

/**
 * mu as -dVa/dVg1 at constant Ia: the Va where each neighbouring curve carries Ia, fitted across
 * curves by a low-degree polynomial in Vg1 (Va at constant Ia is close to linear in Vg1, exactly
 * so under the 3/2-power law), which averages the crossings' noise. A crossing counts only where
 * the curve's slope is within a factor of two of the slope at the point: along a line of
 * constant current a triode's ra hardly changes, while a pentode's curves reach the same current
 * only in their knee, far from the point. Null where the curves around Vg1 do not reach Ia that
 * way inside their measured range.
 */
function muFromVaShift(
  family: AnodeFamily,
  vaVolts: number,
  vg1Volts: number,
  iaMilliamps: number,
  slopeMilliampsPerVolt: number,
  lower: number,
): Estimate | null {
  const set = family.set;
  const m = set.curves.length;
  const vaAt = new Float64Array(m).fill(NaN);
  const vaUnc = new Float64Array(m).fill(NaN);
  const first = Math.max(0, lower - 2);
  const last = Math.min(m - 1, lower + 3);
  for (let j = first; j <= last; j++) {
    const curve = set.curves[j];
    const va = curve.abscissaAt(iaMilliamps, vaVolts);
    const s = va === null ? null : curve.sampleAt(va);
    if (va === null || !s) continue;
    if (!(s.slope >= slopeMilliampsPerVolt / 2 && s.slope <= 2 * slopeMilliampsPerVolt)) continue;
    vaAt[j] = va;
    vaUnc[j] = s.yUncertainty / s.slope;
  }
  // The crossings must form an unbroken run of curves through the two around Vg1; of those,
  // the (up to) five nearest Vg1 take part.
  if (isNaN(vaAt[lower]) || isNaN(vaAt[lower + 1])) return null;
  let a = lower;
  let b = lower + 1;
  while (a > first && !isNaN(vaAt[a - 1])) a--;
  while (b < last && !isNaN(vaAt[b + 1])) b++;
  while (b - a + 1 > 5) {
    if (Math.abs(set.params[a] - vg1Volts) > Math.abs(set.params[b] - vg1Volts)) a++;
    else b--;
  }
  const n = b - a + 1;
  const x = new Float64Array(n);
  for (let r = 0; r < n; r++) x[r] = set.params[a + r] - vg1Volts;
  const y = vaAt.subarray(a, b + 1);
  const u = vaUnc.subarray(a, b + 1);
  const fit = polynomialAtZero(x, y, u, n);
  if (!fit) return null;
  let slope = 0;
  let noise = 0;
  for (let r = 0; r < n; r++) {
    slope += fit.slopeWeights[r] * y[r];
    noise += (fit.slopeWeights[r] * u[r]) ** 2;
  }
  return estimate(-slope, Math.hypot(Math.sqrt(noise), fit.slopeGap));
}

/** Analyses the family at the Vg1 where Ia equals the given current at Va. */
export function operatingPointAtCurrent(
  family: AnodeFamily,
  vaVolts: number,
  iaMilliamps: number,
): OperatingPoint | Refusal {
  const set = family.set;
  const ps = set.params;
  const samples = set.section(vaVolts);
  const q = samples.map((s) => s?.y ?? null);
  const at = `at Va ${formatNumber(vaVolts)} V`;
  let bracket = -1;
  for (let j = ps.length - 2; j >= 0 && bracket < 0; j--) {
    const a = q[j];
    const b = q[j + 1];
    if (a !== null && b !== null && (a - iaMilliamps) * (b - iaMilliamps) <= 0) bracket = j;
  }
  if (bracket < 0) {
    const known = q.map((v, j) => ({ v, j })).filter((e) => e.v !== null) as {
      v: number;
      j: number;
    }[];
    if (known.length === 0) {
      return refuse(`Va ${formatNumber(vaVolts)} V is outside the measured range of every curve`);
    }
    const top = known.reduce((x, y) => (y.v > x.v ? y : x));
    const bottom = known.reduce((x, y) => (y.v < x.v ? y : x));
    const ia = `Ia ${formatNumber(iaMilliamps)} mA ${at}`;
    return iaMilliamps > top.v
      ? refuse(
          `${ia} is above the highest current measured there ` +
            `(${formatNumber(top.v)} mA on the ${formatNumber(ps[top.j])} V curve)`,
        )
      : refuse(
          `${ia} is below the lowest current measured there ` +
            `(${formatNumber(bottom.v)} mA on the ${formatNumber(ps[bottom.j])} V curve)`,
        );
  }
  const f = (p: number) => {
    const found = set.surfaceAt(p, samples);
    return found.ok ? found.point.y - iaMilliamps : NaN;
  };
  const vg1 = findRoot(f, ps[bracket], ps[bracket + 1], 1e-9 * (ps[bracket + 1] - ps[bracket]));
  if (vg1 === null) {
    return refuse(
      `no grid voltage gives Ia ${formatNumber(iaMilliamps)} mA ${at} within the measured curves`,
    );
  }
  const point = operatingPointAt(family, vaVolts, vg1);
  if (!point.ok) return point;
  const gm = point.gmMicrosiemens.value / 1000;
  return {
    ...point,
    vg1Volts: estimate(vg1, point.iaMilliamps.uncertainty / gm),
    iaMilliamps: estimate(iaMilliamps, 0),
  };
}
