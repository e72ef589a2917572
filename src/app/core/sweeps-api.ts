import { HttpClient, HttpParams, type HttpResponse } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { SweepPlan, SweepPoint, SweepStatus } from '../../../shared/domain/sweep';
import type { SweepView } from '../../../shared/hub/messages';

/** Body of POST /api/sweeps. */
export interface StartSweepRequest {
  benchId: number;
  plan: SweepPlan;
  valveType?: string;
  valveLabel?: string;
  /** Valve record the sweep is saved to. */
  valveId?: number;
  /** Admin only: check the plan against the bench limits alone, not the type's ratings. */
  override?: boolean;
}

/** Query of GET /api/sweeps; page is 1-based. */
export interface SweepQuery {
  page: number;
  pageSize: number;
  sort: string;
  order: 'asc' | 'desc';
  status: SweepStatus | '';
  q: string;
  /** Only sweeps of this bench. */
  benchId?: number;
}

/** One page of sweeps. */
export interface SweepPage {
  items: SweepView[];
  total: number;
  page: number;
  pageSize: number;
}

/** A sweep with every stored point. */
export type SweepWithPoints = SweepView & { points: SweepPoint[] };

/** File formats of a sweep export. */
export type ExportFormat = 'csv' | 'json';

/** Sweeps over REST: start, abort, list, read, export. */
@Injectable({ providedIn: 'root' })
export class SweepsApi {
  private readonly http = inject(HttpClient);

  start(request: StartSweepRequest): Observable<SweepView> {
    return this.http.post<SweepView>('/api/sweeps', request);
  }

  abort(id: number): Observable<unknown> {
    return this.http.post(`/api/sweeps/${id}/abort`, {});
  }

  list(query: SweepQuery): Observable<SweepPage> {
    let params = new HttpParams()
      .set('page', query.page)
      .set('pageSize', query.pageSize)
      .set('sort', query.sort)
      .set('order', query.order);
    if (query.status) params = params.set('status', query.status);
    if (query.q.trim()) params = params.set('q', query.q.trim());
    if (query.benchId !== undefined) params = params.set('benchId', query.benchId);
    return this.http.get<SweepPage>('/api/sweeps', { params });
  }

  get(id: number): Observable<SweepWithPoints> {
    return this.http.get<SweepWithPoints>(`/api/sweeps/${id}`);
  }

  /** The export as a blob: the bearer header rules out a plain download link. */
  exportFile(id: number, format: ExportFormat): Observable<HttpResponse<Blob>> {
    return this.http.get(`/api/sweeps/${id}/export`, {
      params: { format },
      responseType: 'blob',
      observe: 'response',
    });
  }
}
