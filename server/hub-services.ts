import { createAuditService } from './audit/audit.service';
import { createAuthService } from './auth/auth.service';
import { createBenchService } from './benches/bench.service';
import type { HubConfig } from './config';
import type { HubDb } from './db/database';
import type { Logger } from './http/error-middleware';
import { BenchPresence } from './live/bench-presence';
import { DEMO_WORKSHOP } from './demo/demo-data';
import { createMailer } from './mail/mailer';
import { BrowserFanout, type BrowserFanoutProps } from './live/browser-fanout';
import { quickTestLookups } from './quick-tests/quick-test-lookups';
import { createQuickTestRunner } from './quick-tests/quick-test-runner';
import { createQuickTestService } from './quick-tests/quick-test.service';
import { createSweepRecorder } from './sweeps/sweep-recorder';
import { createSweepService } from './sweeps/sweep.service';

/** Settings the services take from the configuration. */
export type ServiceConfig = Pick<
  HubConfig,
  'jwtSecret' | 'jwtLifetimeSeconds' | 'linkGraceMs' | 'startTimeoutMs'
> &
  Partial<Pick<HubConfig, 'smtpUrl' | 'workshopName' | 'demo'>>;

/** Every service of the hub, wired together. */
export type HubServices = ReturnType<typeof createHubServices>;

/**
 * Wires the services. The browser fan-out is the services' event sink, so REST changes and
 * bridge reports reach browsers the same way. Needs no listening server (supertest can use it).
 */
export function createHubServices(
  db: HubDb,
  config: ServiceConfig,
  logger: Logger,
  fanoutOptions: Pick<
    BrowserFanoutProps,
    'watchOptions' | 'closeAboveBytes' | 'benchesDelayMs'
  > = {},
) {
  const presence = new BenchPresence();
  const audit = createAuditService({ db });
  const auth = createAuthService({ db, audit, ...config });
  const browsers: BrowserFanout = new BrowserFanout({
    logger,
    ...fanoutOptions,
    listBenches: () => benches.list(),
    sweepView: (id) => sweeps.view(id),
    loadPoints: (id, fromSeq) => sweeps.points(id, fromSeq),
    abortSweep: (id, user) => sweeps.abort(id, user),
    abortQuickTest: (id, user) => quickTests.abort(id, user),
  });
  const events = browsers;
  const benches = createBenchService({ db, presence, audit, events });
  const recorder = createSweepRecorder({
    db,
    presence,
    events,
    logger,
    linkGraceMs: config.linkGraceMs,
    startTimeoutMs: config.startTimeoutMs,
  });
  const sweeps = createSweepService({ db, presence, benches, recorder, audit, events });
  const quickTestRunner = createQuickTestRunner({
    db,
    presence,
    events,
    logger,
    startTimeoutMs: config.startTimeoutMs,
  });
  const quickTests = createQuickTestService({
    db,
    presence,
    benches,
    audit,
    events,
    runner: quickTestRunner,
    ...quickTestLookups(db),
  });
  const mailer = createMailer(config.smtpUrl ?? null, process.env.MAIL_FROM || undefined);
  const workshopName =
    config.workshopName ?? (config.demo === false ? 'Emberline workshop' : DEMO_WORKSHOP);
  return {
    db,
    logger,
    mailer,
    workshopName,
    presence,
    audit,
    auth,
    benches,
    recorder,
    sweeps,
    quickTestRunner,
    quickTests,
    browsers,
    events,
  };
}
