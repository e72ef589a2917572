import type { KorenModel } from './koren-model';

/**
 * A Koren model as a SPICE subcircuit in plain SPICE3 syntax, usable by ngspice, LTspice and
 * other SPICE3-family simulators: behavioural current sources (B elements) with the published
 * expressions and the parameters written in as numbers (no .PARAM, which SPICE3 itself lacks).
 * Nodes: A G K for triodes, A G K G2 for pentodes. Currents in A, as in Koren's paper (KG1 and
 * KG2 are defined for amperes). Powers are written exp(EX*ln(x)) and clipped below at 1e-30,
 * so that no simulator meets a fractional power of a negative number. No grid current is
 * modelled: keep the grid at or below the cathode. A comment line carries the parameters for
 * people and tools.
 */
export function korenSpiceSubcircuit(model: KorenModel, name: string, note?: string): string {
  const id = name.replace(/[^A-Za-z0-9_]/g, '_');
  const p = model.params;
  const n = spiceNumber;
  const lines = [`* ${id}: Koren ${model.kind} model (N. Koren, Glass Audio 8(5), 1996)`];
  if (note) lines.push(`* ${note.replace(/[\r\n]+/g, ' ')}`);
  if (model.kind === 'triode') {
    lines.push(
      `* koren-triode MU=${n(p.mu)} EX=${n(p.ex)} KG1=${n(p.kg1)} KP=${n(p.kp)} KVB=${n(p.kvb)}`,
      `.SUBCKT ${id} A G K`,
      // E1 = Va/KP * ln(1 + exp(KP*(1/MU + Vg/sqrt(KVB + Va^2)))); Ia = 2*E1^EX/KG1
      `BA A K I=2/${n(p.kg1)}*exp(${n(p.ex)}*ln(uramp(V(A,K))/${n(p.kp)}` +
        `*ln(1+exp(${n(p.kp)}*(1/${n(p.mu)}+V(G,K)/sqrt(${n(p.kvb)}+V(A,K)*V(A,K)))))+1e-30))`,
      `.ENDS ${id}`,
    );
  } else {
    const kg2 = model.params.kg2;
    lines.push(
      `* koren-pentode MU=${n(p.mu)} EX=${n(p.ex)} KG1=${n(p.kg1)} KG2=${n(kg2)} KP=${n(p.kp)} ` +
        `KVB=${n(p.kvb)}`,
      `.SUBCKT ${id} A G K G2`,
      // E1 = Vg2/KP * ln(1 + exp(KP*(1/MU + Vg/Vg2))); Ia = 2*E1^EX/KG1 * atan(Va/KVB)
      `BA A K I=2/${n(p.kg1)}*exp(${n(p.ex)}*ln(uramp(V(G2,K))/${n(p.kp)}` +
        `*ln(1+exp(${n(p.kp)}*(1/${n(p.mu)}+V(G,K)/(uramp(V(G2,K))+1e-6))))+1e-30))` +
        `*atan(uramp(V(A,K))/${n(p.kvb)})`,
      // Ig2 = (Vg + Vg2/MU)^EX / KG2
      `BS G2 K I=exp(${n(p.ex)}*ln(uramp(V(G,K)+V(G2,K)/${n(p.mu)})+1e-30))/${n(kg2)}`,
      `.ENDS ${id}`,
    );
  }
  return lines.join('\n') + '\n';
}

/** A number as SPICE reads it: up to 9 significant figures, plain exponent, no unit suffix. */
function spiceNumber(x: number): string {
  const s = Number(x.toPrecision(9)).toString();
  return s.replace('e+', 'e');
}
