import { HttpClient, HttpParams, type HttpResponse } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { PointSpread } from './matching-api';

/** Where a match set stands. */
export type MatchSetStatus = 'reserved' | 'sold' | 'released';

/** A member's readings at one operating point: V, mA, µS. */
export interface MemberReading {
  label: string;
  vg1Volts: number | null;
  iaMilliamps: number | null;
  gmMicrosiemens: number | null;
}

/** Conditions of the sweep a member was matched on. V. */
export interface SweepConditions {
  vaStartVolts: number;
  vaStopVolts: number;
  vaStepVolts: number;
  vg1Volts: number[];
  vg2Volts: number;
  heaterVolts: number;
}

/** One valve of a set with what it was matched on. */
export interface MatchSetMember {
  valveId: number;
  label: string;
  valveType: string;
  status: string;
  grade: string | null;
  gradePercent: number | null;
  readings: MemberReading[];
  sweepId: number | null;
  sweptAt: string | null;
  bench: string | null;
  conditions: SweepConditions | null;
}

/** A match set in a list. */
export interface MatchSetSummary {
  id: number;
  code: string;
  valveType: string;
  status: MatchSetStatus;
  memberCount: number;
  labels: string[];
  createdBy: string | null;
  createdAt: string;
}

/** Spreads and verdict of a set. %. */
export interface MatchSetFigures {
  scorePercent: number;
  acceptable: boolean;
  tolerancePercent: number;
  curveSpreadPercent: number | null;
  exceeds: string[];
  points: PointSpread[];
}

/** A report mailing of a set. */
export interface MatchSetMailing {
  to: string;
  at: string;
  by: string | null;
  messageId: string | null;
}

/** A buyer's link of a set (its token is never shown again). */
export interface MatchSetShare {
  id: number;
  expiresAt: string;
  revokedAt: string | null;
}

/** A match set with its members, spreads, mailings and links. */
export interface MatchSetDetail extends MatchSetSummary {
  criteria: Record<string, unknown>;
  runId: number | null;
  figures: MatchSetFigures;
  members: MatchSetMember[];
  mailings: MatchSetMailing[];
  shares: MatchSetShare[];
}

/** A page of sets. */
export interface MatchSetPage {
  items: MatchSetSummary[];
  total: number;
  page: number;
  pageSize: number;
}

/** Answer of POST /api/match-sets/:id/share: the link is shown this once. */
export interface CreatedShare {
  id: number;
  url: string;
  reportUrl: string;
  token: string;
  expiresAt: string;
}

/** Answer of POST /api/match-sets/:id/send-report. */
export interface SentReport {
  to: string;
  at: string;
  messageId: string;
}

/** Match sets over REST: reserve, list, release, sell, report, mail and buyer links. */
@Injectable({ providedIn: 'root' })
export class MatchSetsApi {
  private readonly http = inject(HttpClient);

  /** Reserves group `groupIndex` (0-based) of run `runId`; 409 if a member is taken. */
  reserve(runId: number, groupIndex: number): Observable<MatchSetDetail> {
    return this.http.post<MatchSetDetail>('/api/match-sets', { runId, groupIndex });
  }

  list(page: number, pageSize: number, status: MatchSetStatus | ''): Observable<MatchSetPage> {
    let params = new HttpParams().set('page', page).set('pageSize', pageSize);
    if (status) params = params.set('status', status);
    return this.http.get<MatchSetPage>('/api/match-sets', { params });
  }

  get(id: number): Observable<MatchSetDetail> {
    return this.http.get<MatchSetDetail>(`/api/match-sets/${id}`);
  }

  release(id: number): Observable<MatchSetDetail> {
    return this.http.post<MatchSetDetail>(`/api/match-sets/${id}/release`, {});
  }

  sell(id: number): Observable<MatchSetDetail> {
    return this.http.post<MatchSetDetail>(`/api/match-sets/${id}/sell`, {});
  }

  sendReport(id: number, to: string, message?: string): Observable<SentReport> {
    return this.http.post<SentReport>(`/api/match-sets/${id}/send-report`, {
      to,
      ...(message ? { message } : {}),
    });
  }

  share(id: number, expiresInDays: number): Observable<CreatedShare> {
    return this.http.post<CreatedShare>(`/api/match-sets/${id}/share`, { expiresInDays });
  }

  withdrawShare(id: number, shareId: number): Observable<unknown> {
    return this.http.delete(`/api/match-sets/${id}/share/${shareId}`);
  }

  /** The PDF as a blob: the bearer header rules out a plain download link. */
  reportPdf(id: number): Observable<HttpResponse<Blob>> {
    return this.http.get(`/api/match-sets/${id}/report.pdf`, {
      responseType: 'blob',
      observe: 'response',
    });
  }
}
