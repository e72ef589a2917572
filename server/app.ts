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
import { registerDevMailRoutes } from './mail/dev-mail.routes';
import { createMatchSetShares } from './matching/match-set-shares';
import { createMatchSetService } from './matching/match-set.service';
import { createMatchingService } from './matching/matching.service';
import { registerMatchingRoutes } from './matching/matching.routes';
import { registerQuickTestRoutes } from './quick-tests/quick-test.routes';
import { renderMatchReportPdf } from './reports/match-report-pdf';
import { ROUTES, type ApiMount } from './route-table';
import { registerSweepRoutes } from './sweeps/sweep.routes';
import { registerSettingsRoutes } from './settings/settings.routes';
import { createSettingsService } from './settings/settings.service';
import { PhotoStore } from './uploads/photo-store';
import { registerPhotoRoutes } from './uploads/photo.routes';
import { createPhotoService } from './uploads/photo.service';
import { uploadsDirOf } from './uploads/uploads-dir';
import { registerValveTypeRoutes } from './valve-types/valve-type.routes';
import { createValveTypeService } from './valve-types/valve-type.service';
import { refreshFiguresOfType } from './valves/refresh-sweep-figures';
import { registerValveRoutes } from './valves/valve.routes';
import { createValveService } from './valves/valve.service';

/** What the Express app is built from. */
export interface AppDeps {
  services: HubServices;
  /** Version for /api/health and the API document. */
  version: string;
  /** Built Angular app; served with a history fallback when the directory exists. */
  staticDir: string | null;
  /** Where photos are stored; default `uploads` beside the database file (DATA_DIR/uploads). */
  uploadsDir?: string;
  /** The app's public address for links in printed labels; default env PUBLIC_URL, else the
   * address each request came to. */
  publicUrl?: string | null;
}

/** Builds the Express app (REST API and static files) without listening. */
export function createApp(deps: AppDeps): Express {
  const { services, version, staticDir } = deps;
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
  const { db, audit } = services;
  const types = createValveTypeService({
    db,
    audit,
    referenceChanged: (typeId) => refreshFiguresOfType(db, typeId),
  });
  let uploadsDir: Promise<string> | null = null;
  const store = new PhotoStore(() => {
    uploadsDir ??= deps.uploadsDir ? Promise.resolve(deps.uploadsDir) : uploadsDirOf(db);
    return uploadsDir;
  });
  const photos = createPhotoService({ db, audit, store });
  const valves = createValveService({
    db,
    audit,
    photoFiles: { ofValve: (id) => photos.filesOfValve(id), remove: photos.removeFiles },
  });
  registerValveTypeRoutes(api, mount, types);
  registerValveRoutes(api, mount, valves, deps.publicUrl ?? (process.env.PUBLIC_URL || null));
  registerPhotoRoutes(api, mount, photos);
  registerSettingsRoutes(api, mount, createSettingsService({ db, audit }));
  registerBenchRoutes(api, mount, services.benches);
  registerSweepRoutes(api, mount, services.sweeps, services.benches);
  registerQuickTestRoutes(api, mount, services.quickTests);
  registerAuditRoutes(api, mount, services.audit);
  const matchSets = createMatchSetService({
    db,
    audit,
    mailer: services.mailer,
    workshopName: services.workshopName,
    renderPdf: renderMatchReportPdf,
  });
  registerMatchingRoutes(
    api,
    mount,
    createMatchingService({ db, audit }),
    matchSets,
    createMatchSetShares({ db, audit, sets: matchSets }),
    deps.publicUrl ?? (process.env.PUBLIC_URL || null),
  );
  registerDevMailRoutes(api, mount, db);
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
