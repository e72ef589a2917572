import type { Request, Router } from 'express';
import type { ApiMount } from '../route-table';
import { readCsvUpload } from '../uploads/upload-body';
import type { ValveService } from './valve.service';

/** Largest valve CSV an import takes, bytes (1 MiB). */
export const MAX_VALVE_CSV_BYTES = 1024 * 1024;

/** The app's address for links in labels: PUBLIC_URL, else the request's own origin. */
function appOrigin(req: Request, publicUrl: string | null): string {
  if (publicUrl) return publicUrl.replace(/\/+$/, '');
  return `${req.protocol}://${req.get('host') ?? 'localhost'}`;
}

/** /api/valves and its sub-routes (photos have their own module). */
export function registerValveRoutes(
  router: Router,
  mount: ApiMount,
  valves: ValveService,
  publicUrl: string | null,
): void {
  // Before /api/valves/:id, which would otherwise take "export" for an id.
  mount(router, 'GET /api/valves/export', async (_input, res) => {
    const csv = await valves.exportCsv();
    res.status(200).type('text/csv; charset=utf-8').attachment('valves.csv').send(csv);
  });
  mount(router, 'POST /api/valves/import', async ({ user }, res, req) => {
    const { text } = await readCsvUpload(req, res, 'file', MAX_VALVE_CSV_BYTES);
    return valves.importCsv(text, user);
  });
  mount(router, 'GET /api/valves', ({ query }) => valves.list(query));
  mount(router, 'POST /api/valves', ({ body, user }) => valves.create(body, user));
  mount(router, 'GET /api/valves/:id', ({ params }) => valves.detail(params.id));
  mount(router, 'PATCH /api/valves/:id', ({ params, body, user }) =>
    valves.update(params.id, body, user),
  );
  mount(router, 'DELETE /api/valves/:id', async ({ params, user }, res) => {
    await valves.remove(params.id, user);
    res.status(204).end();
  });
  mount(router, 'GET /api/valves/:id/label.svg', async ({ params }, res, req) => {
    const svg = await valves.labelSvg(params.id, appOrigin(req, publicUrl));
    res.status(200).type('image/svg+xml; charset=utf-8').send(svg);
  });
}
