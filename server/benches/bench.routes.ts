import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { BenchService } from './bench.service';

/** GET/POST /api/benches, PATCH /api/benches/:id. */
export function registerBenchRoutes(router: Router, mount: ApiMount, benches: BenchService): void {
  mount(router, 'GET /api/benches', () => benches.list());
  mount(router, 'POST /api/benches', ({ body, user }) => benches.create(body, user));
  mount(router, 'PATCH /api/benches/:id', ({ params, body, user }) =>
    benches.update(params.id, body, user),
  );
}
