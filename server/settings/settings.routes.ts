import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { SettingsService } from './settings.service';

/** GET and PUT /api/settings. */
export function registerSettingsRoutes(
  router: Router,
  mount: ApiMount,
  settings: SettingsService,
): void {
  mount(router, 'GET /api/settings', () => settings.get());
  mount(router, 'PUT /api/settings', ({ body, user }) => settings.update(body, user));
}
