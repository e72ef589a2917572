import {
  type FormControl,
  type FormGroup,
  type NonNullableFormBuilder,
  Validators,
} from '@angular/forms';
import { hasScreen, type ValveClass } from '../../../shared/catalog/valve-types';

/** Construction classes a type may have, with their names in the form. */
export const CLASS_LABELS: Record<ValveClass, string> = {
  triode: 'Triode',
  'double-triode': 'Double triode',
  tetrode: 'Tetrode',
  'beam-tetrode': 'Beam tetrode',
  pentode: 'Pentode',
  diode: 'Diode',
  rectifier: 'Rectifier',
};

/** A designation as the hub takes it: letters, digits and . / - (e.g. 12AX7, 6L6GC). */
export const DESIGNATION_PATTERN = /^[A-Za-z0-9][A-Za-z0-9./-]*$/;

type Optional = FormControl<number | null>;

/** The controls of the new-type form; units V, mA, mA/V, kΩ, W, A. */
export type NewTypeGroup = FormGroup<{
  designation: FormControl<string>;
  equivalents: FormControl<string>;
  valveClass: FormControl<ValveClass>;
  base: FormControl<string>;
  sections: FormControl<number>;
  heaterVolts: FormControl<number | null>;
  heaterAmps: FormControl<number | null>;
  vaVolts: FormControl<number | null>;
  vg2Volts: Optional;
  vg1Volts: FormControl<number | null>;
  iaMilliamps: FormControl<number | null>;
  ig2Milliamps: Optional;
  gmMilliampsPerVolt: Optional;
  raKiloohms: Optional;
  mu: Optional;
  pointSource: FormControl<string>;
  pointConfidence: FormControl<string>;
  vaMaxVolts: FormControl<number | null>;
  vg2MaxVolts: Optional;
  paMaxWatts: FormControl<number | null>;
  pg2MaxWatts: Optional;
  vhkMaxVolts: Optional;
  ratingsSource: FormControl<string>;
  ratingsConfidence: FormControl<string>;
  withModel: FormControl<boolean>;
  modelMu: Optional;
  modelEx: Optional;
  modelKg1: Optional;
  modelKp: Optional;
  modelKvb: Optional;
  modelKg2: Optional;
  modelSource: FormControl<string>;
  notes: FormControl<string>;
}>;

/** Body of POST /api/valve-types: units V, mA, µS, kΩ, W, A. */
export interface NewTypeBody {
  designation: string;
  equivalents: string[];
  valveClass: ValveClass;
  base: string;
  sections: number;
  heaterVolts: number;
  heaterAmps: number;
  operatingPoints: {
    vaVolts: number;
    vg2Volts: number | null;
    vg1Volts: number;
    iaMilliamps: number;
    ig2Milliamps: number | null;
    gmMicrosiemens: number | null;
    raKiloohms: number | null;
    mu: number | null;
    source: string;
    confidence: string | null;
  }[];
  ratings: {
    vaMaxVolts: number;
    vg2MaxVolts: number | null;
    paMaxWatts: number;
    pg2MaxWatts: number | null;
    vhkMaxVolts: number | null;
    source: string;
    confidence: string | null;
  };
  model: {
    kind: 'triode' | 'pentode';
    params: Record<string, number>;
    source: string;
  } | null;
  notes: string | null;
}

/** The new-type form, empty but for a triode on one section. */
export function buildNewTypeForm(fb: NonNullableFormBuilder): NewTypeGroup {
  const required = [Validators.required];
  const positive = [Validators.required, Validators.min(0.000001)];
  const optional = () => fb.control<number | null>(null, Validators.min(0));
  return fb.group({
    designation: fb.control('', [
      Validators.required,
      Validators.maxLength(24),
      Validators.pattern(DESIGNATION_PATTERN),
    ]),
    equivalents: fb.control(''),
    valveClass: fb.control<ValveClass>('triode'),
    base: fb.control('', [Validators.required, Validators.maxLength(24)]),
    sections: fb.control(1, [Validators.required, Validators.min(1), Validators.max(4)]),
    heaterVolts: fb.control<number | null>(null, positive),
    heaterAmps: fb.control<number | null>(null, positive),
    vaVolts: fb.control<number | null>(null, positive),
    vg2Volts: optional(),
    vg1Volts: fb.control<number | null>(null, [...required, Validators.max(50)]),
    iaMilliamps: fb.control<number | null>(null, [...required, Validators.min(0)]),
    ig2Milliamps: optional(),
    gmMilliampsPerVolt: optional(),
    raKiloohms: optional(),
    mu: optional(),
    pointSource: fb.control('', [Validators.required, Validators.maxLength(200)]),
    pointConfidence: fb.control(''),
    vaMaxVolts: fb.control<number | null>(null, positive),
    vg2MaxVolts: optional(),
    paMaxWatts: fb.control<number | null>(null, positive),
    pg2MaxWatts: optional(),
    vhkMaxVolts: optional(),
    ratingsSource: fb.control('', [Validators.required, Validators.maxLength(200)]),
    ratingsConfidence: fb.control(''),
    withModel: fb.control(false),
    modelMu: optional(),
    modelEx: optional(),
    modelKg1: optional(),
    modelKp: optional(),
    modelKvb: optional(),
    modelKg2: optional(),
    modelSource: fb.control(''),
    notes: fb.control('', Validators.maxLength(2000)),
  });
}

/** What is missing before the form can be sent, in words (the hub checks the rest). */
export function newTypeProblems(form: NewTypeGroup): string[] {
  const v = form.getRawValue();
  const problems: string[] = [];
  if (hasScreen(v.valveClass)) {
    if (v.vg2Volts === null)
      problems.push(`A ${CLASS_LABELS[v.valveClass]} needs the point's Vg2.`);
    if (v.vg2MaxVolts === null) problems.push(`A ${CLASS_LABELS[v.valveClass]} needs Vg2 max.`);
  }
  if (v.withModel) {
    const params = [v.modelMu, v.modelEx, v.modelKg1, v.modelKp, v.modelKvb];
    if (hasScreen(v.valveClass)) params.push(v.modelKg2);
    if (params.some((p) => p === null || !(p > 0))) {
      problems.push('Every model parameter must be a positive number.');
    }
    if (!v.modelSource.trim()) problems.push('Name the source of the model.');
  }
  return problems;
}

/** The body the hub takes for the form's values; fields of a screen only for screen classes. */
export function newTypeBody(form: NewTypeGroup): NewTypeBody {
  const v = form.getRawValue();
  const screen = hasScreen(v.valveClass);
  const text = (s: string) => s.trim() || null;
  const params: Record<string, number> = {
    mu: v.modelMu ?? 0,
    ex: v.modelEx ?? 0,
    kg1: v.modelKg1 ?? 0,
    kp: v.modelKp ?? 0,
    kvb: v.modelKvb ?? 0,
  };
  if (screen) params['kg2'] = v.modelKg2 ?? 0;
  return {
    designation: v.designation.trim(),
    equivalents: v.equivalents
      .split(/[,\s]+/)
      .map((e) => e.trim())
      .filter(Boolean),
    valveClass: v.valveClass,
    base: v.base.trim(),
    sections: v.sections,
    heaterVolts: v.heaterVolts ?? 0,
    heaterAmps: v.heaterAmps ?? 0,
    operatingPoints: [
      {
        vaVolts: v.vaVolts ?? 0,
        vg2Volts: screen ? v.vg2Volts : null,
        vg1Volts: v.vg1Volts ?? 0,
        iaMilliamps: v.iaMilliamps ?? 0,
        ig2Milliamps: screen ? v.ig2Milliamps : null,
        gmMicrosiemens:
          v.gmMilliampsPerVolt === null ? null : Math.round(v.gmMilliampsPerVolt * 1e6) / 1e3,
        raKiloohms: v.raKiloohms,
        mu: v.mu,
        source: v.pointSource.trim(),
        confidence: text(v.pointConfidence),
      },
    ],
    ratings: {
      vaMaxVolts: v.vaMaxVolts ?? 0,
      vg2MaxVolts: screen ? v.vg2MaxVolts : null,
      paMaxWatts: v.paMaxWatts ?? 0,
      pg2MaxWatts: screen ? v.pg2MaxWatts : null,
      vhkMaxVolts: v.vhkMaxVolts,
      source: v.ratingsSource.trim(),
      confidence: text(v.ratingsConfidence),
    },
    model: v.withModel
      ? { kind: screen ? 'pentode' : 'triode', params, source: v.modelSource.trim() }
      : null,
    notes: text(v.notes),
  };
}

const FIELD_WORDS: Record<string, string> = {
  designation: 'Designation',
  equivalents: 'Equivalents',
  valveClass: 'Class',
  base: 'Base',
  sections: 'Sections',
  heaterVolts: 'Heater voltage',
  heaterAmps: 'Heater current',
  vaVolts: 'Va',
  vg2Volts: 'Vg2',
  vg1Volts: 'Vg1',
  iaMilliamps: 'Ia',
  ig2Milliamps: 'Ig2',
  gmMicrosiemens: 'gm',
  raKiloohms: 'ra',
  mu: 'mu',
  source: 'source',
  confidence: 'confidence',
  vaMaxVolts: 'Va max',
  vg2MaxVolts: 'Vg2 max',
  paMaxWatts: 'Pa max',
  pg2MaxWatts: 'Pg2 max',
  ikMaxMilliamps: 'Ik max',
  vhkMaxVolts: 'Vhk max',
  notes: 'Notes',
};

/**
 * The form's name for a field the hub refused, e.g. "operatingPoints.0.vaVolts" is
 * "Reference point Va" and "ratings.paMaxWatts" is "Pa max".
 */
export function fieldLabel(path: string): string {
  const parts = path.split('.');
  const word = (name: string | undefined) => (name && FIELD_WORDS[name]) || name || '';
  if (parts[0] === 'operatingPoints') return `Reference point ${word(parts[2])}`.trim();
  if (parts[0] === 'ratings') {
    return parts[1] === 'source' || parts[1] === 'confidence'
      ? `Ratings ${word(parts[1])}`
      : word(parts[1]);
  }
  if (parts[0] === 'model') {
    return parts[1] === 'params'
      ? `Model ${(parts[2] ?? '').toUpperCase()}`
      : `Model ${parts[1] ?? ''}`.trim();
  }
  return word(parts[0]);
}
