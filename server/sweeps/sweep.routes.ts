import type { Router } from 'express';
import type { BenchService } from '../benches/bench.service';
import type { ApiMount } from '../route-table';
import { sweepCsv, sweepJson } from './sweep-export';
import type { SweepService } from './sweep.service';

/** /api/sweeps and its sub-routes. */
export function registerSweepRoutes(
  router: Router,
  mount: ApiMount,
  sweeps: SweepService,
  benches: BenchService,
): void {
  mount(router, 'GET /api/sweeps', ({ query }) => sweeps.list(query));
  mount(router, 'POST /api/sweeps', ({ body, user }) => sweeps.start(body, user));
  mount(router, 'GET /api/sweeps/:id', ({ params }) => sweeps.detail(params.id));
  mount(router, 'POST /api/sweeps/:id/abort', ({ params, user }) => sweeps.abort(params.id, user));
  mount(router, 'POST /api/sweeps/:id/attach', ({ params, body, user }) =>
    sweeps.attach(params.id, body, user),
  );
  mount(router, 'GET /api/sweeps/:id/export', async ({ params, query }, res) => {
    const { points, ...sweep } = await sweeps.detail(params.id);
    const bench = await benches.get(sweep.benchId);
    const csv = query.format === 'csv';
    res
      .status(200)
      .type(csv ? 'text/csv; charset=utf-8' : 'application/json; charset=utf-8')
      .attachment(`sweep-${sweep.id}.${query.format}`)
      .send(csv ? sweepCsv(sweep, bench.name, points) : sweepJson(sweep, bench.name, points));
  });
}
