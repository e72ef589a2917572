import type { Generated } from 'kysely';
import type { ValveClass } from '../../shared/catalog/valve-types';

/** Row of `valve_types`. Heater in V and A. */
export interface ValveTypeTable {
  id: Generated<number>;
  /** Unique regardless of case. */
  designation: string;
  /** JSON array of equivalent designations. */
  equivalents_json: string;
  valve_class: ValveClass;
  base: string;
  sections: number;
  heater_volts: number;
  heater_amps: number;
  model_kind: 'triode' | 'pentode' | null;
  /** JSON of the Koren parameters (KorenTriodeParams or KorenPentodeParams). */
  model_params_json: string | null;
  model_source: string | null;
  notes: string | null;
  created_at: string;
  updated_at: string;
  updated_by: number | null;
}

/** Row of `type_operating_points`: V, V, V, mA, mA, µS, kΩ. Position 0 is the reference. */
export interface TypeOperatingPointTable {
  id: Generated<number>;
  valve_type_id: number;
  position: number;
  va_volts: number;
  vg2_volts: number | null;
  vg1_volts: number;
  ia_milliamps: number;
  ig2_milliamps: number | null;
  gm_microsiemens: number | null;
  ra_kiloohms: number | null;
  mu: number | null;
  source: string;
  confidence: string | null;
}

/** Row of `type_ratings`, one per type: V, V, W, W, mA, V. */
export interface TypeRatingsTable {
  valve_type_id: number;
  va_max_volts: number;
  vg2_max_volts: number | null;
  pa_max_watts: number;
  pg2_max_watts: number | null;
  ik_max_milliamps: number | null;
  vhk_max_volts: number | null;
  source: string;
  confidence: string | null;
}

/** Row of `nominal_curve_sets`: the uploaded nominal curves of a type, one set per type. */
export interface NominalCurveSetTable {
  valve_type_id: number;
  source: string;
  point_count: number;
  uploaded_by: number | null;
  uploaded_at: string;
}

/** Row of `nominal_points`: V, V, mA, mA. */
export interface NominalPointTable {
  valve_type_id: number;
  seq: number;
  vg1_volts: number;
  va_volts: number;
  ia_milliamps: number;
  ig2_milliamps: number | null;
}
