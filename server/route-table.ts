import type { Router } from 'express';
import { z } from 'zod';
import { auditListQuery, auditPage } from './audit/audit.schemas';
import { authUserSchema, loginBody, loginResponse } from './auth/auth.schemas';
import {
  benchViewSchema,
  createBenchBody,
  createdBenchResponse,
  patchBenchBody,
} from './benches/bench.schemas';
import { idParams } from './http/common-schemas';
import {
  quickTestListQuery,
  quickTestPage,
  quickTestViewSchema,
  startQuickTestBody,
} from './quick-tests/quick-test.schemas';
import { putSettingsBody, workshopSettingsSchema } from './settings/settings.schemas';
import { photoViewSchema } from './uploads/photo.schemas';
import {
  createValveTypeBody,
  designationParams,
  nominalCurveQuery,
  nominalCurvesSchema,
  nominalPreviewSchema,
  patchValveTypeBody,
  valveTypeViewSchema,
} from './valve-types/valve-type.schemas';
import {
  createValveBody,
  patchValveBody,
  valveDetailSchema,
  valveExportQuery,
  valveImportReport,
  valveListQuery,
  valvePage,
  valveViewSchema,
} from './valves/valve.schemas';
import type { RouteHandler, RouteKey, RouteSpec } from './http/route-spec';
import { MATCHING_ROUTES } from './matching/matching-route-specs';
import {
  attachSweepBody,
  startSweepBody,
  sweepDetailSchema,
  sweepExportQuery,
  sweepListQuery,
  sweepPage,
  sweepViewSchema,
} from './sweeps/sweep.schemas';

/**
 * Every REST route with its least role and its schemas: the one place that says who may call
 * what. Routes are mounted from it, the API document is generated from it, and the role tests
 * iterate over it.
 */
export const ROUTES = {
  'GET /api/health': {
    minRole: null,
    tag: 'system',
    summary: 'Hub and database are up',
    response: z.object({ status: z.literal('ok'), version: z.string(), db: z.literal('ok') }),
  },
  'GET /api/openapi.json': { minRole: null, tag: 'system', summary: 'This document' },
  'POST /api/auth/login': {
    minRole: null,
    tag: 'auth',
    summary: 'Sign in with user name and password',
    body: loginBody,
    response: loginResponse,
  },
  'GET /api/auth/me': {
    minRole: 'viewer',
    tag: 'auth',
    summary: 'The signed-in user',
    response: authUserSchema,
  },
  'GET /api/valve-types': {
    minRole: 'viewer',
    tag: 'valve types',
    summary: 'The type library: published figures with sources, and a default plan per type',
    response: z.array(valveTypeViewSchema),
  },
  'POST /api/valve-types': {
    minRole: 'admin',
    tag: 'valve types',
    summary: 'Add a type with its operating points and maximum ratings',
    body: createValveTypeBody,
    response: valveTypeViewSchema,
    status: 201,
  },
  'GET /api/valve-types/:designation': {
    minRole: 'viewer',
    tag: 'valve types',
    summary: 'One type, by designation or equivalent',
    params: designationParams,
    response: valveTypeViewSchema,
  },
  'PATCH /api/valve-types/:designation': {
    minRole: 'admin',
    tag: 'valve types',
    summary: 'Change a type (ratings merge field by field; the bench checks use them at once)',
    params: designationParams,
    body: patchValveTypeBody,
    response: valveTypeViewSchema,
  },
  'DELETE /api/valve-types/:designation': {
    minRole: 'admin',
    tag: 'valve types',
    summary: 'Delete a type no valve record uses',
    params: designationParams,
    status: 204,
  },
  'GET /api/valve-types/:designation/nominal-curves': {
    minRole: 'viewer',
    tag: 'valve types',
    summary: "The type's nominal curves (empty until uploaded)",
    params: designationParams,
    response: nominalCurvesSchema,
  },
  'POST /api/valve-types/:designation/nominal-curves/preview': {
    minRole: 'admin',
    tag: 'valve types',
    summary:
      'Read a nominal-curve CSV (va,vg1,ia[,ig2] in V, V, mA, mA; multipart field "file" or a text/csv body, at most 1 MiB) without saving it',
    params: designationParams,
    response: nominalPreviewSchema,
  },
  'POST /api/valve-types/:designation/nominal-curves': {
    minRole: 'admin',
    tag: 'valve types',
    summary: 'Replace the nominal curves with a CSV (as the preview) and its source',
    params: designationParams,
    query: nominalCurveQuery,
    response: nominalCurvesSchema,
    status: 201,
  },
  'GET /api/valves/export': {
    minRole: 'viewer',
    tag: 'valves',
    summary: 'Every valve record as CSV',
    query: valveExportQuery,
    produces: ['text/csv'],
  },
  'POST /api/valves/import': {
    minRole: 'technician',
    tag: 'valves',
    summary:
      'Add valve records from CSV (multipart field "file" or a text/csv body, at most 1 MiB); bad rows are reported by line and do not stop the good ones',
    response: valveImportReport,
  },
  'GET /api/valves': {
    minRole: 'viewer',
    tag: 'valves',
    summary: 'Valve records, paged, sorted, filtered and searched',
    query: valveListQuery,
    response: valvePage,
  },
  'POST /api/valves': {
    minRole: 'technician',
    tag: 'valves',
    summary: 'Add a valve record (label generated when not given)',
    body: createValveBody,
    response: valveViewSchema,
    status: 201,
  },
  'GET /api/valves/:id': {
    minRole: 'viewer',
    tag: 'valves',
    summary: 'A valve record with its sweeps and the trend of its figures',
    params: idParams,
    response: valveDetailSchema,
  },
  'PATCH /api/valves/:id': {
    minRole: 'technician',
    tag: 'valves',
    summary: 'Change a valve record',
    params: idParams,
    body: patchValveBody,
    response: valveViewSchema,
  },
  'DELETE /api/valves/:id': {
    minRole: 'admin',
    tag: 'valves',
    summary: 'Delete a valve record and its photos (its sweeps stay, off the record)',
    params: idParams,
    status: 204,
  },
  'GET /api/valves/:id/label.svg': {
    minRole: 'viewer',
    tag: 'valves',
    summary: 'A printable 50 x 25 mm label with a QR code of the record address',
    params: idParams,
    produces: ['image/svg+xml'],
  },
  'GET /api/valves/:id/photos': {
    minRole: 'viewer',
    tag: 'photos',
    summary: "A valve record's photos",
    params: idParams,
    response: z.array(photoViewSchema),
  },
  'POST /api/valves/:id/photos': {
    minRole: 'technician',
    tag: 'photos',
    summary: 'Add a photo (multipart field "photo"; JPEG, PNG or WebP by content; at most 5 MiB)',
    params: idParams,
    response: photoViewSchema,
    status: 201,
  },
  'GET /api/photos/:id': {
    minRole: 'viewer',
    tag: 'photos',
    summary: 'A photo',
    params: idParams,
    produces: ['image/jpeg', 'image/png', 'image/webp'],
  },
  'GET /api/photos/:id/thumb': {
    minRole: 'viewer',
    tag: 'photos',
    summary: 'A thumbnail of a photo (WebP, at most 320 px)',
    params: idParams,
    produces: ['image/webp'],
  },
  'DELETE /api/photos/:id': {
    minRole: 'technician',
    tag: 'photos',
    summary: 'Delete a photo',
    params: idParams,
    status: 204,
  },
  'GET /api/settings': {
    minRole: 'viewer',
    tag: 'settings',
    summary: 'Workshop settings: label scheme and grade thresholds',
    response: workshopSettingsSchema,
  },
  'PUT /api/settings': {
    minRole: 'admin',
    tag: 'settings',
    summary: 'Change some workshop settings',
    body: putSettingsBody,
    response: workshopSettingsSchema,
  },
  'GET /api/benches': {
    minRole: 'viewer',
    tag: 'benches',
    summary: 'Benches with live state',
    response: z.array(benchViewSchema),
  },
  'POST /api/benches': {
    minRole: 'admin',
    tag: 'benches',
    summary: 'Add a bench; answers its token once',
    body: createBenchBody,
    response: createdBenchResponse,
    status: 201,
  },
  'PATCH /api/benches/:id': {
    minRole: 'admin',
    tag: 'benches',
    summary: 'Rename a bench or change its limits',
    params: idParams,
    body: patchBenchBody,
    response: benchViewSchema,
  },
  'GET /api/sweeps': {
    minRole: 'viewer',
    tag: 'sweeps',
    summary: 'Sweeps, paged, sorted and filtered',
    query: sweepListQuery,
    response: sweepPage,
  },
  'POST /api/sweeps': {
    minRole: 'technician',
    tag: 'sweeps',
    summary: 'Start a sweep on a bench (checked against bench, tracer and valve type limits)',
    body: startSweepBody,
    response: sweepViewSchema,
    status: 201,
  },
  'GET /api/sweeps/:id': {
    minRole: 'viewer',
    tag: 'sweeps',
    summary: 'A sweep with every stored point',
    params: idParams,
    response: sweepDetailSchema,
  },
  'POST /api/sweeps/:id/abort': {
    minRole: 'technician',
    tag: 'sweeps',
    summary: 'Abort a running sweep',
    params: idParams,
    response: sweepViewSchema,
    status: 202,
  },
  'POST /api/sweeps/:id/attach': {
    minRole: 'technician',
    tag: 'sweeps',
    summary: 'Put an ended sweep on a valve record, move it to another, or take it off',
    params: idParams,
    body: attachSweepBody,
    response: sweepViewSchema,
  },
  'GET /api/sweeps/:id/export': {
    minRole: 'viewer',
    tag: 'sweeps',
    summary: 'Download a sweep as CSV or JSON',
    params: idParams,
    query: sweepExportQuery,
    produces: ['text/csv'],
  },
  'GET /api/audit': {
    minRole: 'admin',
    tag: 'audit',
    summary: 'Audit log, newest first',
    query: auditListQuery,
    response: auditPage,
  },
  'GET /api/quick-tests': {
    minRole: 'viewer',
    tag: 'quick tests',
    summary: 'Quick tests, newest first, filtered by valve record, bench, status or grade',
    query: quickTestListQuery,
    response: quickTestPage,
  },
  'POST /api/quick-tests': {
    minRole: 'technician',
    tag: 'quick tests',
    summary:
      'Run a quick-test set on a bench (leakage, gm, grid current, emission, reduced heater), ' +
      'planned within the bench, tracer and valve type limits',
    body: startQuickTestBody,
    response: quickTestViewSchema,
    status: 201,
  },
  'GET /api/quick-tests/:id': {
    minRole: 'viewer',
    tag: 'quick tests',
    summary: 'A quick test with its part results and, once complete, its grade and reason',
    params: idParams,
    response: quickTestViewSchema,
  },
  'POST /api/quick-tests/:id/abort': {
    minRole: 'technician',
    tag: 'quick tests',
    summary: 'Abort a running quick test',
    params: idParams,
    response: quickTestViewSchema,
    status: 202,
  },
  ...MATCHING_ROUTES,
} as const satisfies Record<RouteKey, RouteSpec>;

/** Key of a route in the table. */
export type ApiRouteKey = keyof typeof ROUTES;

/** The `mount` function bound to this table (see createRouteMounter). */
export type ApiMount = <K extends ApiRouteKey>(
  router: Router,
  key: K,
  handler: RouteHandler<(typeof ROUTES)[K]>,
) => void;
