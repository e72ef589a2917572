import type { PartOutcome } from '../../../shared/grading/quick-test-results';
import { pairTitle, partTitle } from '../../../shared/grading/quick-test-results';

/** One figure of a part's result: what, and the value with its unit. */
export interface PartFigure {
  name: string;
  value: string;
}

/** A part as the box check lists it: title, status, message and figures. */
export interface PartSummary {
  part: PartOutcome['part'];
  title: string;
  status: PartOutcome['status'];
  message: string | null;
  figures: PartFigure[];
}

function fixed(x: number, digits: number): string {
  const text = x.toFixed(digits);
  // A reading that rounds to zero shows no sign ("-0.00" reads as reverse current).
  return Number(text) === 0 ? (0).toFixed(digits) : text.replace('-', '\u2212');
}

/** The figures of one part's result, with units (µA, mA/V, mA, V, %). */
export function partSummary(outcome: PartOutcome): PartSummary {
  const figures: PartFigure[] = [];
  const r = outcome.result;
  if (r?.part === 'leakage') {
    for (const p of r.pairs) {
      figures.push({
        name: `${pairTitle(p.pair)} at ${fixed(p.volts, 0)} V`,
        value: p.overRange
          ? `over range (≥ ${fixed(p.microamps, 1)} µA)`
          : `${fixed(p.microamps, 2)} µA`,
      });
    }
  } else if (r?.part === 'gm') {
    figures.push({
      name: 'gm',
      value: `${fixed(r.measurement.gmMicrosiemens / 1000, 2)} mA/V · ${fixed(r.gmPercent, 0)} % of nominal`,
    });
    figures.push({
      name: 'Ia',
      value: `${fixed(r.measurement.iaMilliamps, 2)} mA · ${fixed(r.iaPercent, 0)} % of nominal`,
    });
  } else if (r?.part === 'grid-current') {
    figures.push({ name: 'grid current', value: `${fixed(r.ig1Microamps, 2)} µA` });
  } else if (r?.part === 'emission') {
    figures.push({
      name: `emission at ${fixed(r.vaVolts, 0)} V`,
      value: r.overRange
        ? `over range (≥ ${fixed(r.milliamps, 1)} mA)`
        : `${fixed(r.milliamps, 2)} mA · ${fixed(r.percent, 0)} % of sound`,
    });
  } else if (r?.part === 'reduced-heater') {
    const change = -r.dropPercent;
    figures.push({
      name: 'gm change at reduced heater',
      value: `${change > 0 ? '+' : ''}${fixed(change, 1)} %`,
    });
  }
  return {
    part: outcome.part,
    title: partTitle(outcome.part),
    status: outcome.status,
    message: outcome.message,
    figures,
  };
}
