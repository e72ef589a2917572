import type { KorenFit } from '../../../shared/analysis/koren-fit';
import { korenSpiceSubcircuit } from '../../../shared/analysis/spice-subcircuit';

/** A SPICE library file of a fitted model: its name and text. */
export interface SpiceModelFile {
  /** File name, e.g. "12AX7-sweep-12.lib". */
  fileName: string;
  /** Subcircuit name inside it, e.g. "12AX7_S12". */
  subcircuit: string;
  /** The file's text. */
  text: string;
}

/** The fitted model of a sweep as a SPICE .lib file with one subcircuit. */
export function spiceModelFile(
  fit: KorenFit,
  designation: string | null,
  sweepId: number,
  valveLabel: string | null,
): SpiceModelFile {
  const base = (designation ?? 'valve').replace(/[^A-Za-z0-9_-]/g, '_');
  const subcircuit = `${base.replace(/-/g, '_')}_S${sweepId}`;
  const of = valveLabel ? ` (${valveLabel})` : '';
  const note =
    `Fitted by Emberline to sweep #${sweepId}${of}: ${fit.pointCount} readings, RMS error ` +
    `${fit.rmsErrorPercent.toFixed(2)} % of ${fit.fullScaleMilliamps.toFixed(2)} mA full scale`;
  return {
    fileName: `${base}-sweep-${sweepId}.lib`,
    subcircuit,
    text: korenSpiceSubcircuit(fit.model, subcircuit, note),
  };
}
