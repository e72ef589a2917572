import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { QuickTestService } from './quick-test.service';

/** /api/quick-tests and its sub-routes. */
export function registerQuickTestRoutes(
  router: Router,
  mount: ApiMount,
  quickTests: QuickTestService,
): void {
  mount(router, 'GET /api/quick-tests', ({ query }) => quickTests.list(query));
  mount(router, 'POST /api/quick-tests', ({ body, user }) => quickTests.start(body, user));
  mount(router, 'GET /api/quick-tests/:id', ({ params }) => quickTests.get(params.id));
  mount(router, 'POST /api/quick-tests/:id/abort', ({ params, user }) =>
    quickTests.abort(params.id, user),
  );
}
