import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createApp } from './app';
import { loadConfig, type HubConfig } from './config';
import { openDatabase } from './db/database';
import { migrateToLatest } from './db/migrate';
import { DEMO_BENCHES, DEMO_USERS, DEMO_WORKSHOP } from './demo/demo-data';
import { ensureAdmin, seedDemo } from './demo/seed';
import type { Logger } from './http/error-middleware';
import { createHubServices, type HubServices } from './hub-services';
import { isEntryPoint } from './is-entry-point';
import { attachLiveHub, type LiveHub } from './live/live-hub';
import { startDevSmtpServer, type DevSmtpServer } from './mail/dev-smtp-server';

/** A running hub. */
export interface RunningHub {
  /** Base URL, e.g. http://127.0.0.1:4300 (ws URLs: replace http with ws, add /ws/...). */
  url: string;
  /** Port actually bound (useful with PORT 0). */
  port: number;
  services: HubServices;
  live: LiveHub;
  /** Closes sockets, the HTTP server and the database. Never exits the process. */
  close(): Promise<void>;
}

/** Logs to the console with a prefix. */
export const consoleLogger: Logger = {
  info: (m) => console.log(`hub: ${m}`),
  warn: (m) => console.warn(`hub: ${m}`),
  error: (m, e) => console.error(`hub: ${m}`, e ?? ''),
};

/**
 * Starts the hub: database, migrations, demo data, HTTP and WebSockets. Throws (never exits) on
 * failure, so callers such as the stack or tests decide what happens next.
 */
export async function createHub(
  config: HubConfig,
  logger: Logger = consoleLogger,
): Promise<RunningHub> {
  const db = openDatabase(config.databaseFile);
  try {
    await migrateToLatest(db);
    if (config.demo) await seedDemo(db, logger);
    else await ensureAdmin(db, config.adminPassword, logger);
  } catch (error) {
    await db.destroy();
    throw error;
  }
  // Demo without a mail server: the hub keeps what it sends, for the admin's mail view.
  let devSmtp: DevSmtpServer | null = null;
  if (!config.smtpUrl && config.demo && config.devSmtpPort !== undefined) {
    try {
      devSmtp = await startDevSmtpServer(db, config.devSmtpPort, logger);
      logger.info(`development mail server on ${devSmtp.url}`);
    } catch (error) {
      // A busy port must not keep the hub down; sending mail then answers 503.
      logger.warn(`development mail server not started: ${(error as Error).message}`);
    }
  }
  const services = createHubServices(
    db,
    { ...config, smtpUrl: config.smtpUrl || devSmtp?.url || null },
    logger,
  );
  const app = createApp({ services, version: config.version, staticDir: config.staticDir });
  const server = createServer(app);
  const live = attachLiveHub({ server, services, logger, pingIntervalMs: config.pingIntervalMs });
  await services.recorder.resume();
  await services.quickTestRunner.resume();

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.port, config.host, () => {
      server.off('error', reject);
      resolve();
    });
  }).catch(async (error) => {
    live.close();
    services.recorder.close();
    services.quickTestRunner.close();
    services.mailer.close();
    await devSmtp?.close();
    await db.destroy();
    throw error;
  });
  const port = (server.address() as AddressInfo).port;
  const host = config.host.includes(':') ? `[${config.host}]` : config.host;

  let closing: Promise<void> | null = null;
  return {
    url: `http://${host}:${port}`,
    port,
    services,
    live,
    close() {
      closing ??= (async () => {
        live.close();
        services.recorder.close();
        services.quickTestRunner.close();
        server.closeAllConnections();
        await new Promise<void>((resolve) => server.close(() => resolve()));
        services.mailer.close();
        await devSmtp?.close();
        await db.destroy();
      })();
      return closing;
    },
  };
}

async function runFromCommandLine(): Promise<void> {
  const config = loadConfig();
  const hub = await createHub(config);
  console.log(`hub listening on ${hub.url} (database ${config.databaseFile})`);
  if (config.demo) {
    console.log(`hub: demo mode, ${DEMO_WORKSHOP}. Sign in as:`);
    for (const u of DEMO_USERS) console.log(`hub:   ${u.username} / ${u.password} (${u.role})`);
    for (const b of DEMO_BENCHES) console.log(`hub:   bench "${b.name}" token ${b.token}`);
  }
  const stop = (signal: string) => {
    console.log(`hub: ${signal}, shutting down`);
    hub.close().then(
      () => process.exit(0),
      (error) => {
        console.error('hub: shutdown failed', error);
        process.exit(1);
      },
    );
  };
  process.once('SIGINT', () => stop('SIGINT'));
  process.once('SIGTERM', () => stop('SIGTERM'));
}

if (isEntryPoint(import.meta.url)) {
  runFromCommandLine().catch((error: unknown) => {
    console.error('hub: could not start:', error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
