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
import type { RouteHandler, RouteKey, RouteSpec } from './http/route-spec';
import {
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
    summary: 'Catalogue of valve types with published figures and a default plan each',
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
} as const satisfies Record<RouteKey, RouteSpec>;

/** Key of a route in the table. */
export type ApiRouteKey = keyof typeof ROUTES;

/** The `mount` function bound to this table (see createRouteMounter). */
export type ApiMount = <K extends ApiRouteKey>(
  router: Router,
  key: K,
  handler: RouteHandler<(typeof ROUTES)[K]>,
) => void;
