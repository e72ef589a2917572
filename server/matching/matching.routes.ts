import type { Request, Router } from 'express';
import type { ApiMount } from '../route-table';
import { matchReportView } from './match-report-view';
import type { MatchSetShares } from './match-set-shares';
import type { MatchSetService } from './match-set.service';
import type { MatchingService } from './matching.service';

/** The app's address for links: PUBLIC_URL, else the request's own origin. */
function appOrigin(req: Request, publicUrl: string | null): string {
  if (publicUrl) return publicUrl.replace(/\/+$/, '');
  return `${req.protocol}://${req.get('host') ?? 'localhost'}`;
}

/** Matching runs, partner search, match sets, their reports, mailings and buyer links. */
export function registerMatchingRoutes(
  router: Router,
  mount: ApiMount,
  matching: MatchingService,
  sets: MatchSetService,
  shares: MatchSetShares,
  publicUrl: string | null,
): void {
  mount(router, 'POST /api/matching/runs', ({ body, user }) => matching.run(body, user));
  mount(router, 'GET /api/matching/runs/:id', ({ params }) => matching.view(params.id));
  mount(router, 'GET /api/valves/:id/partners', ({ params, query }) =>
    matching.partners(params.id, query),
  );

  mount(router, 'GET /api/match-sets', ({ query }) => sets.list(query));
  mount(router, 'POST /api/match-sets', ({ body, user }) => sets.create(body, user));
  mount(router, 'GET /api/match-sets/:id', ({ params }) => sets.detail(params.id));
  mount(router, 'POST /api/match-sets/:id/release', ({ params, user }) =>
    sets.release(params.id, user),
  );
  mount(router, 'POST /api/match-sets/:id/sell', ({ params, user }) => sets.sell(params.id, user));
  mount(router, 'GET /api/match-sets/:id/report', async ({ params }) =>
    matchReportView(await sets.report(params.id)),
  );
  mount(router, 'GET /api/match-sets/:id/report.pdf', async ({ params }, res) => {
    const { fileName, pdf } = await sets.reportPdf(params.id);
    res.status(200).type('application/pdf').attachment(fileName).send(pdf);
  });
  mount(router, 'POST /api/match-sets/:id/send-report', ({ params, body, user }) =>
    sets.sendReport(params.id, body, user),
  );
  mount(router, 'POST /api/match-sets/:id/share', ({ params, body, user }, _res, req) =>
    shares.share(params.id, body.expiresInDays, user, appOrigin(req, publicUrl)),
  );
  mount(router, 'DELETE /api/match-sets/:id/share/:shareId', async ({ params, user }, res) => {
    await shares.revokeShare(params.id, params.shareId, user);
    res.status(204).end();
  });

  mount(router, 'GET /api/shared/match-sets/:token', ({ params }) =>
    shares.sharedView(params.token),
  );
  mount(router, 'GET /api/shared/match-sets/:token/report.pdf', async ({ params }, res) => {
    const { setId } = await shares.sharedSetId(params.token);
    const { fileName, pdf } = await sets.reportPdf(setId);
    res.status(200).type('application/pdf').attachment(fileName).send(pdf);
  });
}
