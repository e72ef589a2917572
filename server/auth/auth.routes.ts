import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { AuthService } from './auth.service';
import { loginLimiters } from './login-limiter';

/** POST /api/auth/login, GET /api/auth/me. */
export function registerAuthRoutes(router: Router, mount: ApiMount, auth: AuthService): void {
  // Before the route: failed attempts are counted once the route has answered.
  router.post('/api/auth/login', ...loginLimiters());
  mount(router, 'POST /api/auth/login', ({ body }) => auth.login(body.username, body.password));
  mount(router, 'GET /api/auth/me', ({ user }) => user);
}
