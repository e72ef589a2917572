import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { GradeThresholds } from '../../../shared/grading/grade-thresholds';
import type { SweepPlan } from '../../../shared/domain/sweep';
import type { NewTypeBody } from './new-type-form';

/** A typical operating point with its source: V, mA, µS, kΩ. */
export interface OperatingPointView {
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
}

/** Maximum ratings with their source: V, W, mA. */
export interface RatingsView {
  vaMaxVolts: number;
  vg2MaxVolts: number | null;
  paMaxWatts: number;
  pg2MaxWatts: number | null;
  ikMaxMilliamps: number | null;
  vhkMaxVolts: number | null;
  source: string;
  confidence: string | null;
}

/** A type of the library as GET /api/valve-types/:designation shows it. */
export interface TypeView {
  id: number;
  designation: string;
  equivalents: string[];
  valveClass: string;
  base: string;
  sections: number;
  heaterVolts: number;
  heaterAmps: number;
  operatingPoints: OperatingPointView[];
  ratings: RatingsView;
  model: { kind: 'triode' | 'pentode'; params: Record<string, number>; source: string } | null;
  notes: string | null;
  hasScreen: boolean;
  hasModel: boolean;
  hasNominalCurves: boolean;
  sources: string[];
  defaultPlan: SweepPlan;
  updatedAt: string;
}

/** Fields an admin may change (ratings merge field by field). */
export interface TypePatch {
  base?: string;
  heaterVolts?: number;
  heaterAmps?: number;
  ratings?: Partial<RatingsView>;
  notes?: string | null;
}

/** Summary of one parsed nominal curve. */
export interface CurveSummary {
  vg1Volts: number;
  pointCount: number;
  vaMinVolts: number;
  vaMaxVolts: number;
}

/** Answer of the nominal-curve preview. */
export interface NominalPreview {
  curves: CurveSummary[];
  pointCount: number;
  hasScreenCurrent: boolean;
}

/** A type's stored nominal curves: V, mA. */
export interface NominalCurves {
  designation: string;
  source: string | null;
  uploadedBy: string | null;
  uploadedAt: string | null;
  curves: {
    vg1Volts: number;
    points: { vaVolts: number; iaMilliamps: number; ig2Milliamps: number | null }[];
  }[];
}

/** The workshop settings. */
export interface WorkshopSettings {
  labelPrefix: string;
  labelDigits: number;
  nextLabelNumber: number;
  gradeThresholds: GradeThresholds;
}

/** The type library, its nominal curves and the workshop's grading settings over REST. */
@Injectable({ providedIn: 'root' })
export class TypesApi {
  private readonly http = inject(HttpClient);

  list(): Observable<TypeView[]> {
    return this.http.get<TypeView[]>('/api/valve-types');
  }

  /** Admin only: adds a type; 409 when the designation or an equivalent is taken. */
  create(body: NewTypeBody): Observable<TypeView> {
    return this.http.post<TypeView>('/api/valve-types', body);
  }

  get(designation: string): Observable<TypeView> {
    return this.http.get<TypeView>(`/api/valve-types/${encodeURIComponent(designation)}`);
  }

  update(designation: string, patch: TypePatch): Observable<TypeView> {
    return this.http.patch<TypeView>(`/api/valve-types/${encodeURIComponent(designation)}`, patch);
  }

  nominalCurves(designation: string): Observable<NominalCurves> {
    return this.http.get<NominalCurves>(
      `/api/valve-types/${encodeURIComponent(designation)}/nominal-curves`,
    );
  }

  previewNominal(designation: string, csv: string): Observable<NominalPreview> {
    return this.http.post<NominalPreview>(
      `/api/valve-types/${encodeURIComponent(designation)}/nominal-curves/preview`,
      csv,
      { headers: { 'Content-Type': 'text/csv' } },
    );
  }

  saveNominal(designation: string, csv: string, source: string): Observable<NominalCurves> {
    return this.http.post<NominalCurves>(
      `/api/valve-types/${encodeURIComponent(designation)}/nominal-curves`,
      csv,
      { headers: { 'Content-Type': 'text/csv' }, params: source ? { source } : {} },
    );
  }

  settings(): Observable<WorkshopSettings> {
    return this.http.get<WorkshopSettings>('/api/settings');
  }

  saveThresholds(gradeThresholds: GradeThresholds): Observable<WorkshopSettings> {
    return this.http.put<WorkshopSettings>('/api/settings', { gradeThresholds });
  }
}
