import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { AuditService } from './audit.service';

/** GET /api/audit. */
export function registerAuditRoutes(router: Router, mount: ApiMount, audit: AuditService): void {
  mount(router, 'GET /api/audit', ({ query }) => audit.list(query));
}
