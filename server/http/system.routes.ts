import type { Router } from 'express';
import { sql } from 'kysely';
import type { HubDb } from '../db/database';
import { ROUTES, type ApiMount } from '../route-table';
import { HttpError } from './http-error';
import { buildOpenApiDocument } from './openapi-document';

/** GET /api/health and GET /api/openapi.json. */
export function registerSystemRoutes(
  router: Router,
  mount: ApiMount,
  db: HubDb,
  version: string,
): void {
  mount(router, 'GET /api/health', async () => {
    await sql`select 1`.execute(db).catch((error: unknown) => {
      throw new HttpError(503, 'db_unavailable', `database check failed: ${String(error)}`);
    });
    return { status: 'ok', version, db: 'ok' };
  });
  const document = buildOpenApiDocument(ROUTES, {
    title: 'Emberline hub API',
    version,
    description:
      'REST API of the Emberline hub. Sign in with POST /api/auth/login and send the token as ' +
      '`Authorization: Bearer <token>`. `x-min-role` gives the least role of each operation.',
  });
  mount(router, 'GET /api/openapi.json', () => document);
}
