import { derivative, parse, type EvalFunction } from 'mathjs';
import type { KorenModel } from '../../../shared/analysis/koren-model';

/** The published Koren expressions (Koren, Glass Audio 8(5), 1996; the 2x form), Ia in mA. */
const TEXT = {
  triode: '2 * (va / kp * log(1 + exp(kp * (1 / mu + vg / sqrt(kvb + va^2)))))^ex / kg1 * 1000',
  pentode:
    '2 * (vg2 / kp * log(1 + exp(kp * (1 / mu + vg / vg2))))^ex / kg1 * atan(va / kvb) * 1000',
};

const compiled = new Map<string, { ia: EvalFunction; dVg: EvalFunction; dVa: EvalFunction }>();

function expressions(kind: 'triode' | 'pentode') {
  let e = compiled.get(kind);
  if (!e) {
    const expr = parse(TEXT[kind]);
    e = {
      ia: expr.compile(),
      dVg: derivative(expr, 'vg').compile(),
      dVa: derivative(expr, 'va').compile(),
    };
    compiled.set(kind, e);
  }
  return e;
}

/**
 * Expected values that do not come from the code under test: the published expression as
 * text, differentiated symbolically by mathjs. Ia (mA), gm (µS), ra (kΩ), mu = gm·ra.
 */
export function korenExpected(
  model: KorenModel,
  vaVolts: number,
  vg1Volts: number,
  vg2Volts = 0,
): { iaMilliamps: number; gmMicrosiemens: number; raKiloohms: number; mu: number } {
  const e = expressions(model.kind);
  const scope = { ...model.params, va: vaVolts, vg: vg1Volts, vg2: vg2Volts };
  const dIaDvg = e.dVg.evaluate(scope) as number;
  const dIaDva = e.dVa.evaluate(scope) as number;
  return {
    iaMilliamps: e.ia.evaluate(scope) as number,
    gmMicrosiemens: 1000 * dIaDvg,
    raKiloohms: 1 / dIaDva,
    mu: dIaDvg / dIaDva,
  };
}
