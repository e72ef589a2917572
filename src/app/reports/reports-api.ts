import { HttpClient, HttpParams, type HttpResponse } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';

/** A member's readings at one operating point: V, mA, µS. */
export interface ReportReading {
  label: string;
  vg1Volts: number | null;
  iaMilliamps: number | null;
  gmMicrosiemens: number | null;
}

/** Conditions of the sweep a member was matched on. V. */
export interface ReportConditions {
  vaStartVolts: number;
  vaStopVolts: number;
  vaStepVolts: number;
  vg1Volts: number[];
  vg2Volts: number;
  heaterVolts: number;
}

/** One measured curve, downsampled: [Va V, Ia mA] pairs at one grid voltage. */
export interface ReportCurve {
  /** Grid-1 voltage of the curve, V. */
  vg1Volts: number;
  points: [number, number][];
}

/** One valve of a report. */
export interface ReportMember {
  valveId: number;
  label: string;
  valveType: string;
  grade: string | null;
  gradePercent: number | null;
  readings: ReportReading[];
  sweepId: number | null;
  sweptAt: string | null;
  bench: string | null;
  conditions: ReportConditions | null;
  curves: ReportCurve[];
}

/** Spread of a set at one operating point. V, mA, µS, %. */
export interface ReportPointSpread {
  label: string;
  /** Section of a double triode, 1 or 2. */
  section: 1 | 2;
  kind: 'fixed-bias' | 'equal-current';
  iaMeanMilliamps: number;
  /** Null at equal-current points, where Ia is equal by design. */
  iaSpreadPercent: number | null;
  gmMeanMicrosiemens: number;
  gmSpreadPercent: number;
  vg1MeanVolts: number;
  /** Anode and screen voltage of the point, V (absent on sets made before they were kept). */
  vaVolts?: number;
  vg2Volts?: number | null;
  vg1SpreadVolts: number;
}

/** Spreads and verdict of a set. %. */
export interface ReportFigures {
  scorePercent: number;
  acceptable: boolean;
  tolerancePercent: number;
  curveSpreadPercent: number | null;
  exceeds: string[];
  points: ReportPointSpread[];
}

/** A match report as GET /api/match-sets/:id/report and a buyer's link give it. */
export interface MatchReportData {
  workshop: string;
  code: string;
  valveType: string;
  status: string;
  createdAt: string;
  figures: ReportFigures;
  /** Where the tolerance comes from (common practice or chosen). */
  toleranceNote: string;
  members: ReportMember[];
  /** What was measured and how to read the figures. */
  notes: string[];
  cautions: string[];
}

/** A report through a buyer's link, with the link's expiry. */
export interface SharedMatchReport extends MatchReportData {
  expiresAt: string;
}

/** An attachment of a received message. */
export interface DevMailAttachment {
  /** Place in the message, 0-based. */
  index: number;
  filename: string;
  contentType: string;
  bytes: number;
}

/** A message the development mail server received. */
export interface DevMailMessage {
  id: number;
  receivedAt: string;
  envelopeFrom: string | null;
  envelopeTo: string[];
  subject: string | null;
  from: string | null;
  to: string | null;
  messageId: string | null;
  textPreview: string | null;
  attachments: DevMailAttachment[];
}

/** The report's PDF through a buyer's link (no sign-in). */
export function sharedReportPdfUrl(token: string): string {
  return `/api/shared/match-sets/${encodeURIComponent(token)}/report.pdf`;
}

/** Match reports, buyers' links and the development outbox over REST. */
@Injectable({ providedIn: 'root' })
export class ReportsApi {
  private readonly http = inject(HttpClient);

  /** The report of set `id` (viewer and up). */
  report(id: number): Observable<MatchReportData> {
    return this.http.get<MatchReportData>(`/api/match-sets/${id}/report`);
  }

  /** The report of set `id` as a PDF, with its headers for the file name. */
  reportPdf(id: number): Observable<HttpResponse<Blob>> {
    return this.http.get(`/api/match-sets/${id}/report.pdf`, {
      observe: 'response',
      responseType: 'blob',
    });
  }

  /** The report behind a buyer's token: 404 unknown, 410 expired or withdrawn. */
  shared(token: string): Observable<SharedMatchReport> {
    return this.http.get<SharedMatchReport>(`/api/shared/match-sets/${encodeURIComponent(token)}`);
  }

  /** Messages the development mail server received, newest first (admin). */
  devMail(limit = 50): Observable<DevMailMessage[]> {
    return this.http.get<DevMailMessage[]>('/api/dev-mail', {
      params: new HttpParams().set('limit', limit),
    });
  }

  /** Attachment `index` of received message `id` (admin). */
  devMailAttachment(id: number, index: number): Observable<Blob> {
    return this.http.get(`/api/dev-mail/${id}/attachments/${index}`, { responseType: 'blob' });
  }
}
