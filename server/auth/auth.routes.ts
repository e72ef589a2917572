import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { AuthService } from './auth.service';

/** POST /api/auth/login, GET /api/auth/me. */
export function registerAuthRoutes(router: Router, mount: ApiMount, auth: AuthService): void {
  mount(router, 'POST /api/auth/login', ({ body }) => auth.login(body.username, body.password));
  mount(router, 'GET /api/auth/me', ({ user }) => user);
}
