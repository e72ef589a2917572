import type { SweepPoint } from '../../shared/domain/sweep';
import type { MatchSetDetail } from '../matching/match-set.schemas';

/** Everything a match report shows. */
export interface MatchReport {
  /** Workshop name in the heading. */
  workshop: string;
  set: MatchSetDetail;
  /** Measured anode family of each member, by valve id. */
  families: Map<number, SweepPoint[]>;
  /** What was measured and the usual cautions. */
  notes: string[];
}

/** The note on method and the cautions printed on every report. */
export const REPORT_NOTES: string[] = [
  'What was measured: each valve was swept on a computer-controlled curve tracer, recording the ' +
    'anode family (anode current Ia against anode voltage Va at stepped grid voltages Vg1) after ' +
    'heater warm-up. Ia and mutual conductance gm are read from the measured curves at the ' +
    'operating points shown; spreads are highest minus lowest in % of the set mean.',
  'Matching tolerance: a spread of 5 % is a usual target, 2-3 % tight and 10 % loose. These ' +
    'figures are common practice in the trade, not a published standard.',
  'Data-sheet values are averages: new valves commonly spread 20-30 % around them, so a matched ' +
    'set is matched to itself, not to the data sheet.',
  'Caution: valve circuits run at high voltages (250-800 V) that can kill; filter capacitors hold ' +
    'charge after switch-off and valve envelopes get hot enough to burn. Work only with the ' +
    "equipment's guarding in place and follow local codes and licensed practice.",
];
