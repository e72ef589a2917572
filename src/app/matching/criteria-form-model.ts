import {
  type AbstractControl,
  type FormControl,
  type FormGroup,
  type NonNullableFormBuilder,
  type ValidationErrors,
  Validators,
} from '@angular/forms';
import type { ValveTypeView } from '../core/valve-types-api';
import type { ValveStatus } from '../valves/valves-api';
import {
  DEFAULT_TOLERANCE_PERCENT,
  defaultScreenVolts,
  driveDefault,
  idleDefault,
  typeHasScreen,
  typeHasSections,
  windowDefault,
} from './criteria-defaults';
import type { FixedBiasPointInput, MatchRunRequest, PoolGrade } from './matching-api';

/** Where valves are compared: at operating points, over a curve window, or both. */
export type CompareAt = 'points' | 'window' | 'both';

/** Lowest grade a pool valve may have ('any' takes ungraded valves too). */
export type MinimumGrade = 'any' | 'strong' | 'fair' | 'weak';

/** Grades each minimum lets into the pool. */
const GRADES_FROM: Record<Exclude<MinimumGrade, 'any'>, PoolGrade[]> = {
  strong: ['strong'],
  fair: ['strong', 'fair'],
  weak: ['strong', 'fair', 'weak'],
};

type Num = FormControl<number | null>;

/** The matching criteria form: V, mA, %, and unitless weights. */
export type CriteriaForm = FormGroup<{
  valveType: FormControl<string>;
  groupSize: FormControl<number>;
  statuses: FormControl<ValveStatus[]>;
  minGrade: FormControl<MinimumGrade>;
  /** yyyy-mm-dd, or '' for any date. */
  sweptSince: FormControl<string>;
  compareAt: FormControl<CompareAt>;
  idleVaVolts: Num;
  idleVg1Volts: Num;
  vg2Volts: Num;
  useDrive: FormControl<boolean>;
  driveVaVolts: Num;
  driveVg1Volts: Num;
  windowVaMinVolts: Num;
  windowVaMaxVolts: Num;
  windowIaMinMilliamps: Num;
  windowIaMaxMilliamps: Num;
  iaWeight: Num;
  gmWeight: Num;
  curveWeight: Num;
  tolerancePercent: Num;
  sections: FormControl<'first' | 'both'>;
  maxImbalancePercent: Num;
  sectionBalanceWeight: Num;
}>;

/** The form's values with every control, enabled or not. */
export type CriteriaValue = ReturnType<CriteriaForm['getRawValue']>;

/** Builds the empty criteria form with its validators. */
export function buildCriteriaForm(fb: NonNullableFormBuilder): CriteriaForm {
  const num = (...v: ((c: AbstractControl) => ValidationErrors | null)[]) =>
    fb.control<number | null>(null, [Validators.required, ...v]);
  const positive = Validators.min(0.001);
  const weight = () => num(Validators.min(0));
  return fb.group(
    {
      valveType: fb.control('', Validators.required),
      groupSize: fb.control(4),
      statuses: fb.control<ValveStatus[]>(['in-stock'], Validators.required),
      minGrade: fb.control<MinimumGrade>('any'),
      sweptSince: fb.control(''),
      compareAt: fb.control<CompareAt>('points'),
      idleVaVolts: num(positive),
      idleVg1Volts: num(Validators.max(0)),
      vg2Volts: num(positive),
      useDrive: fb.control(false),
      driveVaVolts: num(positive),
      driveVg1Volts: num(Validators.max(0)),
      windowVaMinVolts: num(Validators.min(0)),
      windowVaMaxVolts: num(positive),
      windowIaMinMilliamps: num(Validators.min(0)),
      windowIaMaxMilliamps: num(positive),
      iaWeight: weight(),
      gmWeight: weight(),
      curveWeight: weight(),
      tolerancePercent: num(positive, Validators.max(100)),
      sections: fb.control<'first' | 'both'>('first'),
      maxImbalancePercent: fb.control<number | null>(null, Validators.min(0)),
      sectionBalanceWeight: weight(),
    },
    { validators: [windowOrder, someWeight] },
  );
}

/** Criteria defaults for a type: its published reference point as idle, usual tolerance. */
export function criteriaDefaults(type: ValveTypeView): CriteriaValue {
  const idle = idleDefault(type);
  const drive = driveDefault(type);
  const window = windowDefault(type);
  return {
    valveType: type.designation,
    groupSize: 4,
    statuses: ['in-stock'],
    minGrade: 'any',
    sweptSince: '',
    compareAt: 'points',
    idleVaVolts: idle.vaVolts,
    idleVg1Volts: idle.vg1Volts,
    vg2Volts: defaultScreenVolts(type),
    useDrive: false,
    driveVaVolts: drive.vaVolts,
    driveVg1Volts: drive.vg1Volts,
    windowVaMinVolts: window.vaMinVolts,
    windowVaMaxVolts: window.vaMaxVolts,
    windowIaMinMilliamps: window.iaMinMilliamps,
    windowIaMaxMilliamps: window.iaMaxMilliamps,
    iaWeight: 1,
    gmWeight: 1,
    curveWeight: 1,
    tolerancePercent: DEFAULT_TOLERANCE_PERCENT,
    sections: 'first',
    maxImbalancePercent: null,
    sectionBalanceWeight: 0,
  };
}

/**
 * Enables the controls that apply to the type and the chosen comparison, and disables the
 * rest, so a disabled control neither blocks the Run button nor reaches the request.
 */
export function syncCriteriaControls(form: CriteriaForm, type: ValveTypeView | null): void {
  const v = form.getRawValue();
  const points = v.compareAt !== 'window';
  const window = v.compareAt !== 'points';
  const set = (c: AbstractControl, on: boolean) => {
    if (on && c.disabled) c.enable({ emitEvent: false });
    if (!on && c.enabled) c.disable({ emitEvent: false });
  };
  const f = form.controls;
  set(f.idleVaVolts, points);
  set(f.idleVg1Volts, points);
  set(f.useDrive, points);
  set(f.driveVaVolts, points && v.useDrive);
  set(f.driveVg1Volts, points && v.useDrive);
  set(f.iaWeight, points);
  set(f.gmWeight, points);
  set(f.vg2Volts, points && !!type && typeHasScreen(type));
  for (const c of [
    f.windowVaMinVolts,
    f.windowVaMaxVolts,
    f.windowIaMinMilliamps,
    f.windowIaMaxMilliamps,
    f.curveWeight,
  ]) {
    set(c, window);
  }
  const sections = !!type && typeHasSections(type);
  set(f.sections, sections);
  set(f.maxImbalancePercent, sections);
  set(f.sectionBalanceWeight, sections);
  // Emitted on the form only: listeners of single controls (which call this) see nothing.
  form.updateValueAndValidity();
}

/** The request of POST /api/matching/runs for the form's enabled values. */
export function runRequest(form: CriteriaForm): MatchRunRequest {
  const v = form.getRawValue();
  const f = form.controls;
  const on = (c: AbstractControl) => c.enabled;
  const vg2 = on(f.vg2Volts) && v.vg2Volts !== null ? { vg2Volts: v.vg2Volts } : {};
  const request: MatchRunRequest = {
    valveType: v.valveType,
    groupSize: v.groupSize,
    statuses: v.statuses,
    tolerancePercent: v.tolerancePercent ?? DEFAULT_TOLERANCE_PERCENT,
  };
  if (v.minGrade !== 'any') request.grades = GRADES_FROM[v.minGrade];
  if (v.sweptSince) request.dateFrom = new Date(`${v.sweptSince}T00:00:00`).toISOString();
  const weights: MatchRunRequest['weights'] = {};
  if (v.compareAt === 'window') {
    request.operatingPoints = [];
  } else {
    const points: FixedBiasPointInput[] = [
      { label: 'idle', vaVolts: v.idleVaVolts!, vg1Volts: v.idleVg1Volts!, ...vg2 },
    ];
    if (v.useDrive) {
      points.push({ label: 'drive', vaVolts: v.driveVaVolts!, vg1Volts: v.driveVg1Volts!, ...vg2 });
    }
    request.operatingPoints = points;
    weights.ia = v.iaWeight ?? 0;
    weights.gm = v.gmWeight ?? 0;
  }
  if (v.compareAt !== 'points') {
    request.window = {
      vaMinVolts: v.windowVaMinVolts!,
      vaMaxVolts: v.windowVaMaxVolts!,
      iaMinMilliamps: v.windowIaMinMilliamps!,
      iaMaxMilliamps: v.windowIaMaxMilliamps!,
    };
    weights.curve = v.curveWeight ?? 0;
  }
  if (on(f.sections)) {
    request.sections = v.sections;
    if (v.maxImbalancePercent !== null) request.maxSectionImbalancePercent = v.maxImbalancePercent;
    if ((v.sectionBalanceWeight ?? 0) > 0) weights.sectionBalance = v.sectionBalanceWeight!;
  }
  request.weights = weights;
  return request;
}

/** Form values that reproduce the criteria a run was made with, on the type's defaults. */
export function criteriaValue(
  criteria: Partial<MatchRunRequest>,
  type: ValveTypeView,
): CriteriaValue {
  const v = criteriaDefaults(type);
  const fixed = (criteria.operatingPoints ?? []).filter(
    (p): p is FixedBiasPointInput => 'vg1Volts' in p,
  );
  const [idle, drive] = fixed;
  const hasWindow = !!criteria.window;
  const hasPoints = criteria.operatingPoints === undefined ? !hasWindow : fixed.length > 0;
  v.compareAt = hasPoints && hasWindow ? 'both' : hasWindow ? 'window' : 'points';
  if (criteria.groupSize) v.groupSize = criteria.groupSize;
  if (criteria.statuses?.length) v.statuses = [...criteria.statuses];
  v.minGrade = minimumGrade(criteria.grades);
  if (criteria.dateFrom) v.sweptSince = localDate(criteria.dateFrom);
  if (idle) {
    v.idleVaVolts = idle.vaVolts;
    v.idleVg1Volts = idle.vg1Volts;
    if (idle.vg2Volts !== undefined) v.vg2Volts = idle.vg2Volts;
  }
  v.useDrive = !!drive;
  if (drive) {
    v.driveVaVolts = drive.vaVolts;
    v.driveVg1Volts = drive.vg1Volts;
  }
  if (criteria.window) {
    v.windowVaMinVolts = criteria.window.vaMinVolts;
    v.windowVaMaxVolts = criteria.window.vaMaxVolts;
    v.windowIaMinMilliamps = criteria.window.iaMinMilliamps;
    v.windowIaMaxMilliamps = criteria.window.iaMaxMilliamps;
  }
  const w = criteria.weights ?? {};
  v.iaWeight = w.ia ?? 1;
  v.gmWeight = w.gm ?? 1;
  v.curveWeight = w.curve ?? 1;
  v.sectionBalanceWeight = w.sectionBalance ?? 0;
  if (criteria.tolerancePercent !== undefined) v.tolerancePercent = criteria.tolerancePercent;
  if (criteria.sections) v.sections = criteria.sections;
  v.maxImbalancePercent = criteria.maxSectionImbalancePercent ?? null;
  return v;
}

function minimumGrade(grades: PoolGrade[] | undefined): MinimumGrade {
  if (!grades?.length) return 'any';
  if (grades.includes('weak')) return 'weak';
  if (grades.includes('fair')) return 'fair';
  return 'strong';
}

/** yyyy-mm-dd of an ISO instant in the browser's time zone. */
function localDate(iso: string): string {
  const d = new Date(iso);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** The window must run upwards in Va and in Ia. */
function windowOrder(group: AbstractControl): ValidationErrors | null {
  const f = (group as CriteriaForm).controls;
  if (f.windowVaMinVolts.disabled) return null;
  const errors: ValidationErrors = {};
  const [vaMin, vaMax] = [f.windowVaMinVolts.value, f.windowVaMaxVolts.value];
  const [iaMin, iaMax] = [f.windowIaMinMilliamps.value, f.windowIaMaxMilliamps.value];
  if (vaMin !== null && vaMax !== null && vaMax <= vaMin) errors['windowVa'] = true;
  if (iaMin !== null && iaMax !== null && iaMax <= iaMin) errors['windowIa'] = true;
  return Object.keys(errors).length ? errors : null;
}

/** At least one of the Ia, gm and curve weights in use must be above 0. */
function someWeight(group: AbstractControl): ValidationErrors | null {
  const f = (group as CriteriaForm).controls;
  const used = [f.iaWeight, f.gmWeight, f.curveWeight].filter((c) => c.enabled);
  return used.some((c) => (c.value ?? 0) > 0) ? null : { noWeight: true };
}
