import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import type { SweepPoint } from '../domain/sweep';
import { korenGradient } from './koren-gradient';
import { korenCurrents, type KorenModel } from './koren-model';
import { invertMatrix } from './invert-matrix';
import { refuse, type Refusal } from './refusal';

/** Names of the Koren parameters, as in the model's parameter object. */
export type KorenParamName = 'mu' | 'ex' | 'kg1' | 'kp' | 'kvb' | 'kg2';

/** Options for fitKorenModel. */
export interface KorenFitOptions {
  /** Fit only readings with Vg1 at or below this, V (default 0: the model has no grid current). */
  vg1MaxVolts?: number;
  /** Fit only readings at or above this anode voltage, V (default 0). */
  vaMinVolts?: number;
  /** Iteration limit of the least-squares search (default 300). */
  maxIterations?: number;
}

/** A Koren model fitted to a measured family. */
export interface KorenFit {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** The fitted model. */
  model: KorenModel;
  /** Standard uncertainty of each fitted parameter (same unit as the parameter). */
  uncertainty: Partial<Record<KorenParamName, number>>;
  /**
   * Fit quality: RMS of (model - measured) Ia over the fitted readings, in % of the largest
   * measured Ia among them (the family's full scale). Readings near cut-off count like any
   * other, so the figure is not inflated by relative errors of tiny currents.
   */
  rmsErrorPercent: number;
  /** Largest |model - measured| Ia over the fitted readings, in % of the same full scale. */
  maxErrorPercent: number;
  /** The full scale used above: largest measured Ia among the fitted readings, mA. */
  fullScaleMilliamps: number;
  /** Number of readings fitted. */
  pointCount: number;
  /** Iterations the least-squares search took. */
  iterations: number;
  /** Whether KG2 was fitted to screen currents (pentodes with Ig2 readings) or kept as given. */
  kg2Fitted: boolean;
}

const ORDER = ['mu', 'ex', 'kg1', 'kp', 'kvb'] as const;
const ROUND_ITERATIONS = 15;

/**
 * Fits the Koren model of the start's kind to a measured family by Levenberg-Marquardt least
 * squares (package ml-levenberg-marquardt) on Ia in units of full scale, in log-parameter space
 * (every parameter stays positive and is searched in proportion to its size), from the start
 * values (normally the type's published set), within bounds: MU within a factor of 3 of its
 * start, EX in 1..2, KG1, KP and KVB within a factor of 10. Parameter uncertainties from the
 * Jacobian at the optimum, covariance = s²·(JᵀJ)⁻¹ with s² the residual variance. For a pentode,
 * KG2 then follows from the screen currents by linear least squares (the published KG2 values
 * are rough; the model's Ig2 shape is fixed by MU and EX).
 */
export function fitKorenModel(
  points: readonly SweepPoint[],
  start: KorenModel,
  options: KorenFitOptions = {},
): KorenFit | Refusal {
  const vg1Max = options.vg1MaxVolts ?? 0;
  const vaMin = options.vaMinVolts ?? 0;
  const rows = points.filter(
    (p) =>
      Number.isFinite(p.vaVolts) &&
      Number.isFinite(p.vg1Volts) &&
      Number.isFinite(p.iaMilliamps) &&
      p.vg1Volts <= vg1Max &&
      p.vaVolts >= vaMin &&
      p.vaVolts > 0 &&
      (start.kind === 'triode' || p.vg2Volts > 0),
  );
  if (rows.length < 10) {
    return refuse(
      `a model fit needs at least ten readings in the fitted region; found ${rows.length}`,
    );
  }
  const n = rows.length;
  const va = Float64Array.from(rows, (p) => p.vaVolts);
  const vg1 = Float64Array.from(rows, (p) => p.vg1Volts);
  const vg2 = Float64Array.from(rows, (p) => p.vg2Volts);
  const ia = Float64Array.from(rows, (p) => p.iaMilliamps);
  let fullScale = 0;
  for (const v of ia) fullScale = Math.max(fullScale, v);
  if (!(fullScale > 0)) return refuse('no reading in the fitted region carries anode current');
  const modelOf = (theta: ArrayLike<number>): KorenModel => {
    const p = {
      mu: Math.exp(theta[0]),
      ex: Math.exp(theta[1]),
      kg1: Math.exp(theta[2]),
      kp: Math.exp(theta[3]),
      kvb: Math.exp(theta[4]),
    };
    return start.kind === 'triode'
      ? { kind: 'triode', params: p }
      : { kind: 'pentode', params: { ...p, kg2: start.params.kg2 } };
  };
  const current = (model: KorenModel, i: number) =>
    korenCurrents(model, va[i], vg1[i], vg2[i]).iaMilliamps;
  const s = start.params;
  const theta0 = ORDER.map((k) => Math.log(s[k]));
  const lowFactor = [3, 1, 10, 10, 10];
  const minValues = theta0.map((t, k) => (k === 1 ? 0 : t - Math.log(lowFactor[k])));
  const maxValues = theta0.map((t, k) => (k === 1 ? Math.log(2) : t + Math.log(lowFactor[k])));
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const y = Float64Array.from(ia, (v) => v / fullScale);
  const fn = (theta: number[]) => {
    const model = modelOf(theta);
    return (i: number) => current(model, i) / fullScale;
  };
  const jacobian = (theta: number[]) => {
    const model = modelOf(theta);
    return (i: number) =>
      korenGradient(model, current(model, i), va[i], vg1[i], vg2[i]).map((g) => g / fullScale);
  };
  // The package stops only at an iteration limit or an absolute error; run it in rounds and
  // stop once a round no longer improves the sum of squares by a relative 1e-9.
  const limit = options.maxIterations ?? 300;
  let theta = theta0.map((t, k) => Math.min(Math.max(t, minValues[k]), maxValues[k]));
  let error = Infinity;
  let iterations = 0;
  while (iterations < limit) {
    const round = levenbergMarquardt({ x, y }, fn, {
      initialValues: theta,
      minValues,
      maxValues,
      damping: 1e-2,
      maxIterations: Math.min(ROUND_ITERATIONS, limit - iterations),
      errorTolerance: 1e-24 * n,
      jacobianFunction: jacobian,
    });
    iterations += round.iterations;
    const improved = round.parameterError < error * (1 - 1e-9);
    if (round.parameterError <= error) {
      theta = round.parameterValues;
      error = round.parameterError;
    }
    if (!improved || round.iterations < ROUND_ITERATIONS) break;
  }
  if (!theta.every(Number.isFinite)) return refuse('the model fit did not converge');
  let model = modelOf(theta);
  let sse = 0;
  let maxAbs = 0;
  const jtj = Array.from({ length: 5 }, () => new Array<number>(5).fill(0));
  for (let i = 0; i < n; i++) {
    const iaModel = current(model, i);
    const r = iaModel - ia[i];
    sse += r * r;
    maxAbs = Math.max(maxAbs, Math.abs(r));
    const g = korenGradient(model, iaModel, va[i], vg1[i], vg2[i]);
    for (let a = 0; a < 5; a++) for (let b = 0; b < 5; b++) jtj[a][b] += g[a] * g[b];
  }
  const variance = sse / Math.max(n - 5, 1);
  const cov = invertMatrix(jtj);
  const uncertainty: Partial<Record<KorenParamName, number>> = {};
  ORDER.forEach((name, k) => {
    const value = model.params[name];
    uncertainty[name] = cov ? value * Math.sqrt(Math.max(variance * cov[k][k], 0)) : Infinity;
  });
  let kg2Fitted = false;
  if (model.kind === 'pentode') {
    const screen = fitScreen(rows, model.params.mu, model.params.ex);
    if (screen) {
      model = { kind: 'pentode', params: { ...model.params, kg2: screen.kg2 } };
      uncertainty.kg2 = screen.uncertainty;
      kg2Fitted = true;
    }
  }
  return {
    ok: true,
    model,
    uncertainty,
    rmsErrorPercent: (100 * Math.sqrt(sse / n)) / fullScale,
    maxErrorPercent: (100 * maxAbs) / fullScale,
    fullScaleMilliamps: fullScale,
    pointCount: n,
    iterations,
    kg2Fitted,
  };
}

/** KG2 by linear least squares: Ig2 = A·(Vg1 + Vg2/MU)^EX with A = 1000/KG2 (mA). */
function fitScreen(
  rows: readonly SweepPoint[],
  mu: number,
  ex: number,
): { kg2: number; uncertainty: number } | null {
  let sxy = 0;
  let sxx = 0;
  const used: [number, number][] = [];
  for (const p of rows) {
    const base = p.vg1Volts + p.vg2Volts / mu;
    if (!(base > 0) || !(p.ig2Milliamps > 0)) continue;
    const f = base ** ex;
    sxy += f * p.ig2Milliamps;
    sxx += f * f;
    used.push([f, p.ig2Milliamps]);
  }
  if (used.length < 3 || !(sxy > 0)) return null;
  const a = sxy / sxx;
  const sse = used.reduce((acc, [f, v]) => acc + (v - a * f) ** 2, 0);
  const sdA = Math.sqrt(sse / (used.length - 1) / sxx);
  return { kg2: 1000 / a, uncertainty: (1000 * sdA) / (a * a) };
}
