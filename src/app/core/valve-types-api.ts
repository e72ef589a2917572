import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ValveTypeData } from '../../../shared/catalog/valve-types';
import type { SweepPlan } from '../../../shared/domain/sweep';

/** A valve type as GET /api/valve-types returns it: the catalog data plus a starting plan. */
export interface ValveTypeView extends ValveTypeData {
  defaultPlan: SweepPlan;
}

/** Reads the type library. */
@Injectable({ providedIn: 'root' })
export class ValveTypesApi {
  private readonly http = inject(HttpClient);

  list(): Observable<ValveTypeView[]> {
    return this.http.get<ValveTypeView[]>('/api/valve-types');
  }
}
