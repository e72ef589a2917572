import type { Generated } from 'kysely';
import type { OriginKind, ValveStatus } from './valve-status';

/** Row of `valves`: one physical valve. Maker and date code as printed on the glass. */
export interface ValveTable {
  id: Generated<number>;
  /** Unique regardless of case. */
  label: string;
  valve_type_id: number;
  maker: string | null;
  date_code: string | null;
  origin_kind: OriginKind | null;
  origin_text: string | null;
  location: string | null;
  status: ValveStatus;
  notes: string | null;
  created_by: number | null;
  updated_by: number | null;
  created_at: string;
  updated_at: string;
}

/**
 * Row of `sweep_figures`: a sweep's figures at its type's reference operating point, computed
 * from `point_count` points. V, mA, µS, kΩ, % of nominal. `refusal` says why a figure is null.
 */
export interface SweepFiguresTable {
  sweep_id: number;
  point_count: number;
  va_volts: number | null;
  vg1_volts: number | null;
  vg2_volts: number | null;
  nominal_ia_milliamps: number | null;
  nominal_gm_microsiemens: number | null;
  ia_milliamps: number | null;
  gm_microsiemens: number | null;
  ra_kiloohms: number | null;
  mu: number | null;
  ia_percent: number | null;
  gm_percent: number | null;
  refusal: string | null;
  /** How far a cut curve was carried to the point, V (0: none); null before it was kept. */
  extended_volts: number | null;
  computed_at: string;
}
