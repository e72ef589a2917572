import { HttpClient, HttpParams, type HttpResponse } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { HardFail, QuickTestGradeName } from '../../../shared/grading/grade-quick-test';
import type { ValveGrade } from '../../../shared/grading/grade-thresholds';
import type { QuickTestStatus, SweepView } from '../../../shared/hub/messages';

/** Where a valve stands in the workshop (as the hub's valve-status list). */
export const VALVE_STATUSES = [
  'in-stock',
  'on-test',
  'reserved',
  'sold',
  'customer',
  'rejected',
] as const;
/** A valve record's status. */
export type ValveStatus = (typeof VALVE_STATUSES)[number];

/** Where a valve came from. */
export const ORIGIN_KINDS = ['lot', 'supplier', 'customer'] as const;
/** Kind of a valve's origin. */
export type OriginKind = (typeof ORIGIN_KINDS)[number];

/** A record's grade: a quality grade by % of nominal, or a fault a quick test found. */
export type RecordGradeName = ValveGrade | HardFail;

/** A valve record as GET /api/valves lists it. */
export interface ValveView {
  id: number;
  label: string;
  type: string;
  maker: string | null;
  dateCode: string | null;
  originKind: OriginKind | null;
  originText: string | null;
  location: string | null;
  status: ValveStatus;
  notes: string | null;
  /** From the newest sweep with figures or completed quick test. */
  grade: RecordGradeName | null;
  /** gm (Ia where gm is unknown) as % of nominal at the reference point. */
  percentOfNominal: number | null;
  /** What the grade is from. */
  gradeSource: 'sweep' | 'quick-test' | null;
  /** ISO time of that sweep or quick test. */
  gradedAt: string | null;
  sweepCount: number;
  lastSweepAt: string | null;
  createdBy: string | null;
  updatedBy: string | null;
  createdAt: string;
  updatedAt: string;
}

/** Figures of one sweep at the type's reference point: V, mA, µS, kΩ, %. */
export interface SweepFigures {
  sweepId: number;
  at: string;
  vaVolts: number | null;
  vg1Volts: number | null;
  iaMilliamps: number | null;
  gmMicrosiemens: number | null;
  raKiloohms: number | null;
  mu: number | null;
  iaPercent: number | null;
  gmPercent: number | null;
  /** Why there are no figures for this sweep. */
  refusal: string | null;
  /** How far a cut curve was carried past its last reading to the point, V (0: none). */
  extendedVolts: number;
}

/** The reference operating point of a type: V, mA, µS. */
export interface ReferencePoint {
  vaVolts: number;
  vg2Volts: number | null;
  vg1Volts: number;
  iaMilliamps: number;
  gmMicrosiemens: number | null;
}

/** A quick test as a valve's record lists it: V, mA, µS, %. */
export interface QuickTestSummary {
  id: number;
  /** When it ended (or was created, if it never ran). */
  at: string;
  status: QuickTestStatus;
  /** Grade name, or null when it ended without one. */
  grade: QuickTestGradeName | null;
  reason: string | null;
  /** The graded figure (gm or emission), % of nominal. */
  percent: number | null;
  vaVolts: number | null;
  vg1Volts: number | null;
  iaMilliamps: number | null;
  gmMicrosiemens: number | null;
  iaPercent: number | null;
  gmPercent: number | null;
  operator: string;
}

/** Answer of GET /api/valves/:id. */
export interface ValveDetail extends ValveView {
  referencePoint: ReferencePoint;
  /** Newest first. */
  sweeps: SweepView[];
  /** Oldest first. */
  trend: SweepFigures[];
  /** Newest first, at most 200. */
  quickTests: QuickTestSummary[];
}

/** Editable fields of a valve record. */
export interface ValveFields {
  label?: string;
  type?: string;
  maker?: string | null;
  dateCode?: string | null;
  originKind?: OriginKind | null;
  originText?: string | null;
  location?: string | null;
  status?: ValveStatus;
  notes?: string | null;
}

/** Sort keys of the valve list. */
export type ValveSortKey = 'label' | 'type' | 'status' | 'location' | 'updatedAt' | 'grade';

/** Query of GET /api/valves; page is 1-based, empty filters are left out. */
export interface ValveQuery {
  page: number;
  pageSize: number;
  sort: ValveSortKey;
  order: 'asc' | 'desc';
  type: string;
  status: ValveStatus | '';
  grade: RecordGradeName | 'ungraded' | '';
  location: string;
  q: string;
}

/** One page of valve records. */
export interface ValvePage {
  items: ValveView[];
  total: number;
  page: number;
  pageSize: number;
}

/** Answer of POST /api/valves/import. */
export interface ValveImportReport {
  imported: number;
  labels: string[];
  rejected: { line: number; reason: string }[];
  ignoredColumns: string[];
}

/** A photo of a valve. */
export interface PhotoView {
  id: number;
  valveId: number;
  originalName: string;
  mime: string;
  bytes: number;
  width: number | null;
  height: number | null;
  uploadedBy: string | null;
  createdAt: string;
  url: string;
  thumbUrl: string;
}

/** Valve records, their photos and labels over REST. */
@Injectable({ providedIn: 'root' })
export class ValvesApi {
  private readonly http = inject(HttpClient);

  list(query: ValveQuery): Observable<ValvePage> {
    let params = new HttpParams()
      .set('page', query.page)
      .set('pageSize', query.pageSize)
      .set('sort', query.sort)
      .set('order', query.order);
    for (const key of ['type', 'status', 'grade', 'location', 'q'] as const) {
      const value = query[key].trim();
      if (value) params = params.set(key, value);
    }
    return this.http.get<ValvePage>('/api/valves', { params });
  }

  get(id: number): Observable<ValveDetail> {
    return this.http.get<ValveDetail>(`/api/valves/${id}`);
  }

  create(fields: ValveFields & { type: string }): Observable<ValveView> {
    return this.http.post<ValveView>('/api/valves', fields);
  }

  update(id: number, fields: ValveFields): Observable<ValveView> {
    return this.http.patch<ValveView>(`/api/valves/${id}`, fields);
  }

  /** Admin only: deletes the record and its photos; its sweeps and quick tests stay. */
  remove(id: number): Observable<unknown> {
    return this.http.delete(`/api/valves/${id}`);
  }

  /** Every record as CSV, as a blob: the bearer header rules out a plain link. */
  exportCsv(): Observable<HttpResponse<Blob>> {
    return this.http.get('/api/valves/export', {
      params: { format: 'csv' },
      responseType: 'blob',
      observe: 'response',
    });
  }

  importCsv(file: File): Observable<ValveImportReport> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.post<ValveImportReport>('/api/valves/import', body);
  }

  labelSvg(id: number): Observable<string> {
    return this.http.get(`/api/valves/${id}/label.svg`, { responseType: 'text' });
  }

  photos(id: number): Observable<PhotoView[]> {
    return this.http.get<PhotoView[]>(`/api/valves/${id}/photos`);
  }

  uploadPhoto(id: number, file: File): Observable<PhotoView> {
    const body = new FormData();
    body.append('photo', file, file.name);
    return this.http.post<PhotoView>(`/api/valves/${id}/photos`, body);
  }

  deletePhoto(photoId: number): Observable<unknown> {
    return this.http.delete(`/api/photos/${photoId}`);
  }

  /** An image the hub serves only with the bearer header. */
  image(url: string): Observable<Blob> {
    return this.http.get(url, { responseType: 'blob' });
  }
}
