import { HttpClient, HttpParams } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ValveStatus } from '../valves/valves-api';

/** An operating point at fixed bias: Ia and gm are compared at this Va and Vg1. V. */
export interface FixedBiasPointInput {
  label?: string;
  vaVolts: number;
  vg2Volts?: number;
  vg1Volts: number;
}

/** An operating point at equal current: gm is compared where each valve draws iaMilliamps. */
export interface EqualCurrentPointInput {
  label?: string;
  vaVolts: number;
  vg2Volts?: number;
  iaMilliamps: number;
}

/** A region of the anode family over which whole curves are compared. V, mA. */
export interface MatchWindowInput {
  vaMinVolts: number;
  vaMaxVolts: number;
  iaMinMilliamps: number;
  iaMaxMilliamps: number;
  vg1Volts?: number[];
  vaSteps?: number;
}

/** Relative weights of Ia, gm, curve agreement and section balance in the distance. */
export interface MatchWeights {
  ia?: number;
  gm?: number;
  curve?: number;
  sectionBalance?: number;
}

/** Grades a run's pool can be limited to. */
export type PoolGrade = 'strong' | 'fair' | 'weak' | 'ungraded';

/** Body of POST /api/matching/runs. */
export interface MatchRunRequest {
  valveType: string;
  groupSize: number;
  operatingPoints?: (FixedBiasPointInput | EqualCurrentPointInput)[];
  window?: MatchWindowInput;
  weights?: MatchWeights;
  /** Largest spread of a group, % of its mean. */
  tolerancePercent?: number;
  sections?: 'first' | 'both';
  /** Double triodes whose sections differ by more than this are left out, %. */
  maxSectionImbalancePercent?: number;
  statuses?: ValveStatus[];
  grades?: PoolGrade[];
  /** Sweeps taken at or after, ISO 8601. */
  dateFrom?: string;
  dateTo?: string;
}

/** A member of a matched group. */
export interface RunMember {
  valveId: number;
  label: string;
  sweepId: number;
  /** Its own section imbalance, % (null: single section or section 2 not read). */
  sectionImbalancePercent: number | null;
}

/** Spread of a group at one operating point of one section. mA, µS, V, %. */
export interface PointSpread {
  label: string;
  section: number;
  kind: 'fixed-bias' | 'equal-current';
  /** Anode voltage of the point, V (runs kept before the hub gave it have none). */
  vaVolts?: number;
  /** Screen voltage of the point, V (null for triodes; absent on older runs). */
  vg2Volts?: number | null;
  iaMeanMilliamps: number;
  /** null at equal-current points, where Ia agrees by design. */
  iaSpreadPercent: number | null;
  gmMeanMicrosiemens: number;
  gmSpreadPercent: number;
  vg1MeanVolts: number;
  vg1SpreadVolts: number;
}

/** A matched group of a run. */
export interface RunGroup {
  members: RunMember[];
  /** Largest distance between two members, %. */
  scorePercent: number;
  acceptable: boolean;
  points: PointSpread[];
  /** Largest curve difference between two members over the window, % (null: no window). */
  curveSpreadPercent: number | null;
  /** What is over the tolerance, in words. */
  exceeds: string[];
}

/** A valve in no group, with the reason. */
export interface LeftOverValve {
  valveId: number;
  label: string;
  reason: string;
  detail: string;
}

/** Matching tolerances of common practice, %. */
export interface MatchTolerances {
  tightPercent: number;
  usualPercent: number;
  loosePercent: number;
  note: string;
}

/** A kept matching run with its result. */
export interface MatchRun {
  id: number;
  /** The request as the hub kept it. */
  criteria: Partial<MatchRunRequest> & Record<string, unknown>;
  groups: RunGroup[];
  leftOver: LeftOverValve[];
  totalScorePercent: number;
  /** Valves with a usable sweep that were considered. */
  poolSize: number;
  metricDescription: string;
  tolerances: MatchTolerances;
  createdBy: string | null;
  createdAt: string;
}

/** A ranked partner of one valve. */
export interface Partner {
  valveId: number;
  label: string;
  status: string;
  sweepId: number;
  distancePercent: number;
  withinTolerance: boolean;
  exceeds: string[];
}

/** Answer of GET /api/valves/:id/partners. */
export interface PartnerList {
  valveId: number;
  criteria: Record<string, unknown>;
  partners: Partner[];
  metricDescription: string;
}

/** Matching runs and partner search over REST. */
@Injectable({ providedIn: 'root' })
export class MatchingApi {
  private readonly http = inject(HttpClient);

  run(request: MatchRunRequest): Observable<MatchRun> {
    return this.http.post<MatchRun>('/api/matching/runs', request);
  }

  getRun(id: number): Observable<MatchRun> {
    return this.http.get<MatchRun>(`/api/matching/runs/${id}`);
  }

  partners(valveId: number, tolerancePercent: number, limit = 10): Observable<PartnerList> {
    const params = new HttpParams().set('limit', limit).set('tolerancePercent', tolerancePercent);
    return this.http.get<PartnerList>(`/api/valves/${valveId}/partners`, { params });
  }
}
