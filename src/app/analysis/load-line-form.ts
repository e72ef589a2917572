import type { AnodeFamily } from '../../../shared/analysis/anode-family';
import { analyseLoadLine, type AnodeLoad, type GridBias } from '../../../shared/analysis/load-line';
import type { OperatingPoint } from '../../../shared/analysis/operating-point';
import { refuse, type Refusal } from '../../../shared/analysis/refusal';
import { parseTypedNumber } from './format-readout';

/** The load-line panel's fields as typed. V, kΩ. */
export interface LoadLineForm {
  load: AnodeLoad['kind'];
  supplyText: string;
  loadText: string;
  bias: GridBias['kind'];
  vg1Text: string;
  cathodeText: string;
  /** Peak grid swing, V; empty for no swing figures. */
  swingText: string;
}

/** A form that reads as a stage: load, bias and the optional swing. */
export interface LoadLineStage {
  ok: true;
  load: AnodeLoad;
  bias: GridBias;
  /** Peak grid swing, V (null: none asked). */
  swingPeakVolts: number | null;
}

/** The stage a form describes, or what is missing from it. */
export function readLoadLineForm(form: LoadLineForm): LoadLineStage | Refusal {
  const supply = parseTypedNumber(form.supplyText);
  const rl = parseTypedNumber(form.loadText);
  if (supply === null) return refuse('type the supply voltage');
  if (rl === null) return refuse('type the load resistance');
  let bias: GridBias;
  if (form.bias === 'fixed') {
    const vg1 = parseTypedNumber(form.vg1Text);
    if (vg1 === null) return refuse('type the grid bias Vg1');
    bias = { kind: 'fixed', vg1Volts: vg1 };
  } else {
    const rk = parseTypedNumber(form.cathodeText);
    if (rk === null) return refuse('type the cathode resistor');
    bias = { kind: 'cathode', cathodeKiloohms: rk };
  }
  const swingText = form.swingText.trim();
  const swing = swingText ? parseTypedNumber(swingText) : null;
  if (swingText && swing === null) return refuse('the grid swing must be a number of volts');
  return {
    ok: true,
    load: { kind: form.load, supplyVolts: supply, loadKiloohms: rl },
    bias,
    swingPeakVolts: swing,
  };
}

/**
 * A first stage to look at on a family. A resistor from the top of the measured Va span, sized
 * to cross the family from corner to corner (Vb/RL = the highest measured current), or a
 * transformer at 60 % of that span reflecting twice Vb over that current. The bias is the
 * measured curve whose quiescent point (and swing, half-way to the nearer outer curve) the
 * family can answer for, nearest 60 % of the supply (resistor) or 40 % of full scale
 * (transformer). With a marker the line goes through it.
 */
export function defaultLoadLineForm(
  family: AnodeFamily,
  marker: OperatingPoint | null,
  load: AnodeLoad['kind'] = 'resistive',
): LoadLineForm {
  const { vaMaxVolts, iaTopMilliamps } = familyExtent(family);
  const resistive = load === 'resistive';
  const supply = Math.max(10, Math.round(((resistive ? 1 : 0.6) * vaMaxVolts) / 10) * 10);
  const rl = niceResistance(((resistive ? 1 : 2) * supply) / iaTopMilliamps);
  const stage: AnodeLoad = { kind: load, supplyVolts: supply, loadKiloohms: rl };
  const bias = marker ? null : bestBias(family, stage, iaTopMilliamps);
  const vg1 = bias ?? family.curves[Math.floor(family.curves.length / 2)].vg1Volts;
  const form: LoadLineForm = {
    load,
    supplyText: plain(supply),
    loadText: plain(rl),
    bias: 'fixed',
    vg1Text: plain(vg1),
    cathodeText: plain(niceResistance(Math.abs(vg1) / (iaTopMilliamps / 3))),
    swingText: plain(defaultSwing(family, vg1)),
  };
  return marker ? throughMarker(form, marker, family) : form;
}

/** The measured grid voltage that makes the most central stage the family can answer for. */
function bestBias(family: AnodeFamily, load: AnodeLoad, iaTopMilliamps: number): number | null {
  let best: { vg1: number; score: number } | null = null;
  for (const c of family.curves) {
    const swing = defaultSwing(family, c.vg1Volts);
    const a = analyseLoadLine(
      family,
      load,
      { kind: 'fixed', vg1Volts: c.vg1Volts },
      { gridSwingPeakVolts: swing },
    );
    if (!a.ok) continue;
    // Resistor: Q at 60 % of the supply, leaving room for the swing towards high current.
    // Transformer (Q at the supply): Q at 40 % of full scale.
    const score =
      load.kind === 'resistive'
        ? Math.abs(a.quiescent.vaVolts - 0.6 * load.supplyVolts) / load.supplyVolts
        : Math.abs(a.quiescent.iaMilliamps - 0.4 * iaTopMilliamps) / iaTopMilliamps;
    if (!best || score < best.score) best = { vg1: c.vg1Volts, score };
  }
  return best?.vg1 ?? null;
}

/** Highest measured Va, and the highest current at the ends of the curves (the full scale). */
function familyExtent(family: AnodeFamily): { vaMaxVolts: number; iaTopMilliamps: number } {
  let vaMax = 0;
  let iaTop = 0;
  for (const c of family.curves) {
    vaMax = Math.max(vaMax, c.vaMaxVolts);
    const at = family.currentsAt(c.vaMaxVolts, c.vg1Volts);
    if (at.ok) iaTop = Math.max(iaTop, at.iaMilliamps);
  }
  return { vaMaxVolts: vaMax, iaTopMilliamps: iaTop > 0 ? iaTop : 1 };
}

/**
 * The form moved so that the load line passes through the marker at its grid voltage: a
 * resistive supply of Va + Ia·RL, or a transformer at the marker's Va.
 */
export function throughMarker(
  form: LoadLineForm,
  marker: OperatingPoint,
  family: AnodeFamily,
): LoadLineForm {
  const rl = parseTypedNumber(form.loadText) ?? 0;
  const va = marker.vaVolts;
  const supply = form.load === 'resistive' ? va + marker.iaMilliamps.value * rl : va;
  const vg1 = Math.round(marker.vg1Volts.value * 1000) / 1000;
  return {
    ...form,
    supplyText: plain(Math.round(supply * 10) / 10),
    bias: 'fixed',
    vg1Text: plain(vg1),
    swingText: plain(defaultSwing(family, vg1)),
  };
}

/** Half the way to the nearer outer curve, rounded down to 1, 2 or 5 in its decade. */
function defaultSwing(family: AnodeFamily, vg1Volts: number): number {
  const { minVolts, maxVolts } = family.vg1Range();
  const room = Math.min(vg1Volts - minVolts, maxVolts - vg1Volts);
  const target = room / 2;
  if (!(target > 0)) return 0.1;
  const decade = 10 ** Math.floor(Math.log10(target));
  const step = [5, 2, 1].find((m) => m * decade <= target) ?? 1;
  return Number((step * decade).toPrecision(3));
}

const E12 = [1, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2, 10];

/** The nearest E12 resistor value, kΩ. */
export function niceResistance(kiloohms: number): number {
  if (!(kiloohms > 0) || !Number.isFinite(kiloohms)) return 1;
  const decade = 10 ** Math.floor(Math.log10(kiloohms));
  const mantissa = kiloohms / decade;
  const best = E12.reduce((a, b) =>
    Math.abs(Math.log(b / mantissa)) < Math.abs(Math.log(a / mantissa)) ? b : a,
  );
  return Number((best * decade).toPrecision(3));
}

function plain(x: number): string {
  return String(Number(x.toFixed(3)));
}
