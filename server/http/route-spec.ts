import type { Request, Response, Router } from 'express';
import type { z } from 'zod';
import type { AuthUser } from '../auth/auth-user';
import { requireRole, type Authenticate } from '../auth/require-role';
import type { Role } from '../auth/role';
import { validate } from './validate';

/** `METHOD /path` with Express path syntax, e.g. `GET /api/sweeps/:id`. */
export type RouteKey = `${'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'} /${string}`;

/** Everything about a route except its handler: who may call it and what it takes. */
export interface RouteSpec {
  /** Least role allowed; null for routes open to anyone. */
  minRole: Role | null;
  /** One line for the API document. */
  summary: string;
  /** Group in the API document. */
  tag: string;
  params?: z.ZodObject;
  query?: z.ZodObject;
  body?: z.ZodType;
  /** Shape of the success answer, for the API document. */
  response?: z.ZodType;
  /** Success status; 200 by default. */
  status?: number;
  /** Media types of the success answer other than JSON, e.g. text/csv. */
  produces?: readonly string[];
}

type Parsed<T> = T extends z.ZodType ? z.output<T> : undefined;

/** Validated input a handler receives; never `req.query` itself (read-only in Express 5). */
export interface RouteInput<S extends RouteSpec> {
  user: S['minRole'] extends Role ? AuthUser : null;
  params: Parsed<S['params']>;
  query: Parsed<S['query']>;
  body: Parsed<S['body']>;
}

/**
 * A route's handler. A returned value is sent as JSON with the route's status; return
 * undefined after answering yourself (downloads).
 */
export type RouteHandler<S extends RouteSpec> = (
  input: RouteInput<S>,
  res: Response,
  req: Request,
) => unknown;

/** Splits `GET /api/x` into an Express method name and path. */
export function splitRouteKey(
  key: RouteKey,
): ['get' | 'post' | 'put' | 'patch' | 'delete', string] {
  const [method, path] = key.split(' ');
  return [method.toLowerCase() as 'get', path];
}

/**
 * Returns `mount(router, key, handler)`, which registers a handler behind the role guard and
 * validation that the route table prescribes, so no route can forget either.
 */
export function createRouteMounter<T extends Record<RouteKey, RouteSpec>>(
  table: T,
  authenticate: Authenticate,
) {
  return function mount<K extends keyof T & RouteKey>(
    router: Router,
    key: K,
    handler: RouteHandler<T[K]>,
  ): void {
    const spec: RouteSpec = table[key];
    const [method, path] = splitRouteKey(key);
    const guards = spec.minRole ? [requireRole(spec.minRole, authenticate)] : [];
    router[method](path, ...guards, async (req, res) => {
      const input = {
        user: res.locals.user ?? null,
        params: spec.params ? validate(spec.params, req.params, 'path') : undefined,
        query: spec.query ? validate(spec.query, req.query, 'query') : undefined,
        body: spec.body ? validate(spec.body, req.body, 'body') : undefined,
      } as RouteInput<T[K]>;
      const result = await handler(input, res, req);
      if (result !== undefined && !res.headersSent) res.status(spec.status ?? 200).json(result);
    });
  };
}
