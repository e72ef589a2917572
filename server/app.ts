import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { registerAuditRoutes } from './audit/audit.routes';
import { registerAuthRoutes } from './auth/auth.routes';
import { registerBenchRoutes } from './benches/bench.routes';
import { apiNotFound, errorMiddleware } from './http/error-middleware';
import { createRouteMounter } from './http/route-spec';
import { registerSystemRoutes } from './http/system.routes';
import type { HubServices } from './hub-services';
import { ROUTES, type ApiMount } from './route-table';
import { registerSweepRoutes } from './sweeps/sweep.routes';
import { registerValveTypeRoutes } from './valve-types/valve-type.routes';

/** What the Express app is built from. */
export interface AppDeps {
  services: HubServices;
  /** Version for /api/health and the API document. */
  version: string;
  /** Built Angular app; served with a history fallback when the directory exists. */
  staticDir: string | null;
}

/** Builds the Express app (REST API and static files) without listening. */
export function createApp({ services, version, staticDir }: AppDeps): Express {
  const app = express();
  app.use(
    helmet({
      // The app may be served over plain HTTP on a workshop LAN: upgrading its requests to
      // HTTPS would break it. Everything else of the default policy stays.
      contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } },
      strictTransportSecurity: false,
    }),
  );
  app.use('/api', express.json({ limit: '1mb' }));

  const mount: ApiMount = createRouteMounter(ROUTES, (req) => services.auth.authenticate(req));
  const api = express.Router();
  registerSystemRoutes(api, mount, services.db, version);
  registerAuthRoutes(api, mount, services.auth);
  registerValveTypeRoutes(api, mount);
  registerBenchRoutes(api, mount, services.benches);
  registerSweepRoutes(api, mount, services.sweeps, services.benches);
  registerAuditRoutes(api, mount, services.audit);
  app.use(api);
  app.use('/api', apiNotFound);

  if (staticDir && existsSync(path.join(staticDir, 'index.html'))) {
    app.use(express.static(staticDir, { index: false, maxAge: '1h' }));
    // Deep links of the single-page app get its index page; the router takes it from there.
    app.get('/{*splat}', (_req, res) => {
      res.sendFile(path.join(staticDir, 'index.html'), { maxAge: 0 });
    });
  }

  app.use(errorMiddleware(services.logger));
  return app;
}
