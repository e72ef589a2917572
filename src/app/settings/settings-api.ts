import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { GradeThresholds } from '../../../shared/grading/grade-thresholds';

/** Hard-fail limits of a quick test, uA and %. */
export interface QuickTestLimits {
  reducedHeaterMaxDropPercent: number;
  gasMaxMicroamps: number;
  leakageMaxMicroamps: number;
  electrodeLeakageMaxMicroamps: number;
  shortMinMicroamps: number;
}

/** The workshop's settings as GET /api/settings answers. */
export interface WorkshopSettingsView {
  labelPrefix: string;
  labelDigits: number;
  nextLabelNumber: number;
  gradeThresholds: GradeThresholds;
  quickTestLimits: QuickTestLimits;
}

/** Any settings to change; the rest stay. */
export type SettingsChange = Partial<Omit<WorkshopSettingsView, 'quickTestLimits'>> & {
  quickTestLimits?: Partial<QuickTestLimits>;
};

/** The hub's workshop settings. */
@Injectable({ providedIn: 'root' })
export class SettingsApi {
  private readonly http = inject(HttpClient);

  get(): Observable<WorkshopSettingsView> {
    return this.http.get<WorkshopSettingsView>('/api/settings');
  }

  save(change: SettingsChange): Observable<WorkshopSettingsView> {
    return this.http.put<WorkshopSettingsView>('/api/settings', change);
  }
}
