import type { AnodeSurface, Currents } from './anode-surface';
import { findRoot } from './find-root';
import { fivePointDistortion, threePointSecondHarmonicPercent } from './harmonic-distortion';
import { formatNumber, refuse, type Refusal } from './refusal';

/** The anode load. kΩ, V. */
export type AnodeLoad =
  | {
      /** A resistor from the supply: Va = Vb - Ia·RL (DC and AC). */
      kind: 'resistive';
      /** Supply voltage, V. */
      supplyVolts: number;
      /** Load resistor, kΩ. */
      loadKiloohms: number;
    }
  | {
      /** An output transformer: DC line nearly vertical at the supply, AC line of slope -1/RL. */
      kind: 'transformer';
      /** Supply voltage, V. */
      supplyVolts: number;
      /** Reflected AC load, kΩ. */
      loadKiloohms: number;
      /** DC resistance of the primary, kΩ (default 0: a vertical DC line). */
      primaryKiloohms?: number;
    };

/** How the grid is biased. V, kΩ. */
export type GridBias =
  | { kind: 'fixed'; vg1Volts: number }
  | {
      /** Self bias: Vg1 = -Rk·Ik with Ik = Ia + Ig2; Rk bypassed for signal. */
      kind: 'cathode';
      /** Cathode resistor, kΩ. */
      cathodeKiloohms: number;
    };

/** Options of a load-line analysis. */
export interface LoadLineOptions {
  /** Peak grid swing for the large-signal figures, V (none: no swing analysis). */
  gridSwingPeakVolts?: number;
  /** Anode dissipation rating to check the operating point against, W. */
  paMaxWatts?: number;
}

/** A point on the Va-Ia plane, V and mA. */
export interface PlanePoint {
  /** Anode voltage, V. */
  vaVolts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
}

/** One grid drive of the swing analysis. */
export interface SwingPoint extends PlanePoint {
  /** Fraction of the peak swing: +1, +1/2, 0, -1/2, -1. */
  drive: number;
  /** Grid voltage, V. */
  vg1Volts: number;
}

/** Large-signal figures for a peak grid swing about the operating point. */
export interface SwingAnalysis {
  /** Peak grid swing, V. */
  gridSwingPeakVolts: number;
  /** The five drives along the AC load line, most positive grid first. */
  points: SwingPoint[];
  /** Voltage gain magnitude: anode swing peak-to-peak over grid swing peak-to-peak. */
  voltageGain: number;
  /** Anode voltage swing peak-to-peak, V. */
  outputSwingPeakToPeakVolts: number;
  /** Output power (Vmax - Vmin)(Imax - Imin)/8, W (the fundamental into the AC load). */
  outputPowerWatts: number;
  /** Second harmonic by the three-point method, %. */
  secondHarmonicThreePointPercent: number;
  /** D2, D3, D4 by the five-point method (Espley), %. */
  fivePoint: { d2Percent: number; d3Percent: number; d4Percent: number };
}

/** The operating point and load lines of a stage. */
export interface LoadLineAnalysis {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** The quiescent operating point. */
  quiescent: PlanePoint & {
    /** Grid voltage, V. */
    vg1Volts: number;
    /** Screen current, mA. */
    ig2Milliamps: number;
    /** Anode dissipation Va·Ia, W. */
    paWatts: number;
  };
  /** Two points of the DC load line (through the supply at zero current). */
  dcLine: [PlanePoint, PlanePoint];
  /** Two points of the AC load line (through the operating point, slope -1/RL). */
  acLine: [PlanePoint, PlanePoint];
  /** Large-signal figures, where a swing was asked for. */
  swing: SwingAnalysis | null;
  /** The operating point against the dissipation rating, where one was given. */
  dissipation: { paMaxWatts: number; withinRating: boolean } | null;
}

const DRIVES = [1, 0.5, 0, -0.5, -1];

/**
 * Operating point and load lines on a surface (a measured family or a model). The DC condition
 * is Va = Vb - Ia·Rdc - Ik·Rk (Rdc the load resistor or the primary's resistance, Rk the
 * cathode resistor); with cathode bias, Vg1 = -Rk·Ik is solved by a bracketed root search over
 * grid voltage (Brent), each step solving the DC condition for Va. Swing points lie on the AC
 * line through the operating point, each solved for Va at its grid voltage. Refuses where any
 * point needed falls outside the surface's known region.
 */
export function analyseLoadLine(
  surface: AnodeSurface,
  load: AnodeLoad,
  bias: GridBias,
  options: LoadLineOptions = {},
): LoadLineAnalysis | Refusal {
  const vb = load.supplyVolts;
  const rl = load.loadKiloohms;
  const rdc = load.kind === 'resistive' ? rl : (load.primaryKiloohms ?? 0);
  const rk = bias.kind === 'cathode' ? bias.cathodeKiloohms : 0;
  if (!(vb > 0) || !(rl > 0) || rdc < 0 || rk < 0) {
    return refuse('supply voltage and load must be positive, resistances not negative');
  }
  const q =
    bias.kind === 'fixed'
      ? solveDc(surface, bias.vg1Volts, vb, rdc, 0)
      : solveCathodeBias(surface, vb, rdc, rk);
  if (!q.ok) return q;
  const { vaVolts: vq, iaMilliamps: iq } = q;
  const paWatts = (vq * iq) / 1000;
  const rTotal = rdc + rk;
  const top = Math.max(2 * iq, 1e-9);
  const dcLine: [PlanePoint, PlanePoint] =
    rTotal * top >= vb
      ? [
          { vaVolts: vb, iaMilliamps: 0 },
          { vaVolts: 0, iaMilliamps: vb / rTotal },
        ]
      : [
          { vaVolts: vb, iaMilliamps: 0 },
          { vaVolts: vb - rTotal * top, iaMilliamps: top },
        ];
  const acLine: [PlanePoint, PlanePoint] = [
    { vaVolts: 0, iaMilliamps: iq + vq / rl },
    { vaVolts: vq + rl * iq, iaMilliamps: 0 },
  ];
  let swing: SwingAnalysis | null = null;
  if (options.gridSwingPeakVolts !== undefined) {
    const peak = options.gridSwingPeakVolts;
    if (!(peak > 0)) return refuse('the grid swing must be a positive peak voltage');
    const points: SwingPoint[] = [];
    for (const drive of DRIVES) {
      const vg1 = q.vg1Volts + drive * peak;
      if (drive === 0) {
        points.push({ drive, vg1Volts: vg1, vaVolts: vq, iaMilliamps: iq });
        continue;
      }
      const found = solveOnLine(surface, vg1, (va, c) => va + rl * (c.iaMilliamps - iq) - vq);
      if (!found.ok) {
        return refuse(`at a grid swing of ${formatNumber(peak)} V peak: ${found.reason}`);
      }
      points.push({ drive, vg1Volts: vg1, vaVolts: found.vaVolts, iaMilliamps: found.iaMilliamps });
    }
    const [pMax, px, , py, pMin] = points;
    const swingVolts = pMin.vaVolts - pMax.vaVolts;
    const five = fivePointDistortion({
      maxMilliamps: pMax.iaMilliamps,
      xMilliamps: px.iaMilliamps,
      zeroMilliamps: iq,
      yMilliamps: py.iaMilliamps,
      minMilliamps: pMin.iaMilliamps,
    });
    swing = {
      gridSwingPeakVolts: peak,
      points,
      voltageGain: swingVolts / (2 * peak),
      outputSwingPeakToPeakVolts: swingVolts,
      outputPowerWatts: (swingVolts * (pMax.iaMilliamps - pMin.iaMilliamps)) / 8 / 1000,
      secondHarmonicThreePointPercent: threePointSecondHarmonicPercent(
        pMax.iaMilliamps,
        iq,
        pMin.iaMilliamps,
      ),
      fivePoint: {
        d2Percent: five.d2Percent,
        d3Percent: five.d3Percent,
        d4Percent: five.d4Percent,
      },
    };
  }
  return {
    ok: true,
    quiescent: {
      vaVolts: vq,
      iaMilliamps: iq,
      vg1Volts: q.vg1Volts,
      ig2Milliamps: q.ig2Milliamps,
      paWatts,
    },
    dcLine,
    acLine,
    swing,
    dissipation:
      options.paMaxWatts !== undefined
        ? { paMaxWatts: options.paMaxWatts, withinRating: paWatts <= options.paMaxWatts }
        : null,
  };
}

type Solved = {
  ok: true;
  vaVolts: number;
  iaMilliamps: number;
  ig2Milliamps: number;
  vg1Volts: number;
};

/** The Va on a line g(Va, currents) = 0 (g rising with Va) at a grid voltage. */
function solveOnLine(
  surface: AnodeSurface,
  vg1Volts: number,
  g: (vaVolts: number, c: Currents) => number,
): Solved | Refusal {
  const span = surface.vaRangeAt(vg1Volts);
  if (!span.ok) return span;
  const at = (va: number) => {
    const c = surface.currentsAt(va, vg1Volts);
    return c.ok ? g(va, c) : NaN;
  };
  const lo = at(span.minVolts);
  const hi = at(span.maxVolts);
  const where = `at Vg1 ${formatNumber(vg1Volts)} V`;
  if (lo > 0) {
    return refuse(
      `${where} the load line meets the curve below its measured Va (${formatNumber(span.minVolts)} V)`,
    );
  }
  if (hi < 0) {
    return refuse(
      `${where} the load line meets the curve above its measured Va (${formatNumber(span.maxVolts)} V)`,
    );
  }
  const va = findRoot(at, span.minVolts, span.maxVolts, 1e-9 * (span.maxVolts + 1));
  if (va === null)
    return refuse(`${where} the load line crosses a part of the curve that was not measured`);
  const c = surface.currentsAt(va, vg1Volts);
  if (!c.ok) return c;
  return {
    ok: true,
    vaVolts: va,
    iaMilliamps: c.iaMilliamps,
    ig2Milliamps: c.ig2Milliamps,
    vg1Volts,
  };
}

/** The DC operating point at a grid voltage: Va = Vb - Ia·Rdc - (Ia + Ig2)·Rk. */
function solveDc(
  surface: AnodeSurface,
  vg1Volts: number,
  supplyVolts: number,
  rdcKiloohms: number,
  rkKiloohms: number,
): Solved | Refusal {
  return solveOnLine(
    surface,
    vg1Volts,
    (va, c) =>
      va +
      rdcKiloohms * c.iaMilliamps +
      rkKiloohms * (c.iaMilliamps + c.ig2Milliamps) -
      supplyVolts,
  );
}

/** Cathode bias: the grid voltage where Vg1 + Rk·Ik = 0, found over the measured grid span. */
function solveCathodeBias(
  surface: AnodeSurface,
  supplyVolts: number,
  rdcKiloohms: number,
  rkKiloohms: number,
): Solved | Refusal {
  const { minVolts, maxVolts } = surface.vg1Range();
  const top = Math.min(maxVolts, 0);
  if (!(rkKiloohms > 0)) return solveDc(surface, top, supplyVolts, rdcKiloohms, 0);
  const balance = (vg1: number) => {
    const q = solveDc(surface, vg1, supplyVolts, rdcKiloohms, rkKiloohms);
    return q.ok ? vg1 + rkKiloohms * (q.iaMilliamps + q.ig2Milliamps) : NaN;
  };
  // Scan from the top of the grid span down for the first change of sign, then refine.
  const steps = 40;
  let prevVg = top;
  let prev = balance(top);
  for (let n = 1; n <= steps; n++) {
    const vg = top - ((top - minVolts) * n) / steps;
    const h = balance(vg);
    if (Number.isFinite(prev) && Number.isFinite(h) && prev >= 0 && h <= 0) {
      const root = findRoot(balance, vg, prevVg, 1e-9 * (Math.abs(minVolts) + 1));
      if (root === null) break;
      return solveDc(surface, root, supplyVolts, rdcKiloohms, rkKiloohms);
    }
    prevVg = vg;
    prev = h;
  }
  return refuse(
    `no grid voltage in the measured span (${formatNumber(minVolts)} to ${formatNumber(top)} V) ` +
      `satisfies Vg1 = -Rk·Ik with Rk ${formatNumber(rkKiloohms)} kΩ and a ` +
      `${formatNumber(supplyVolts)} V supply`,
  );
}
