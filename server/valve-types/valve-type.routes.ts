import type { Router } from 'express';
import { defaultPlan, hasScreen, VALVE_TYPES } from '../../shared/catalog/valve-types';
import type { ApiMount } from '../route-table';

/** The catalogue with a default plan per type; computed once, it never changes at run time. */
const CATALOGUE = VALVE_TYPES.map((t) => ({
  ...t,
  hasScreen: hasScreen(t.valveClass),
  hasModel: t.model !== null,
  defaultPlan: defaultPlan(t),
}));

/** GET /api/valve-types. */
export function registerValveTypeRoutes(router: Router, mount: ApiMount): void {
  mount(router, 'GET /api/valve-types', () => CATALOGUE);
}
