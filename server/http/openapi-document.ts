import { z } from 'zod';
import { errorResponse } from './common-schemas';
import { splitRouteKey, type RouteKey, type RouteSpec } from './route-spec';

type JsonSchema = Record<string, unknown>;

function jsonSchema(schema: z.ZodType, io: 'input' | 'output'): JsonSchema {
  const { $schema: _dialect, ...rest } = z.toJSONSchema(schema, { io, unrepresentable: 'any' });
  return rest;
}

function parameters(schema: z.ZodObject | undefined, where: 'path' | 'query') {
  if (!schema) return [];
  const s = jsonSchema(schema, 'input') as {
    properties?: Record<string, JsonSchema>;
    required?: string[];
  };
  return Object.entries(s.properties ?? {}).map(([name, p]) => ({
    name,
    in: where,
    required: where === 'path' || (s.required ?? []).includes(name),
    description: p.description,
    schema: p,
  }));
}

const ERROR_STATUSES: Record<string, string> = {
  '400': 'Invalid request; `fields` names each bad field',
  '401': 'Not signed in, or the sign-in expired',
  '403': 'Signed in with too low a role',
  '404': 'No such entity',
  '409': 'Conflicts with the current state (bench offline or busy, name taken)',
  '422': 'Plan outside the limits of bench, tracer or valve type',
};

/**
 * Builds an OpenAPI 3.1 document from the route table: paths, roles (`x-min-role`), request
 * schemas and answers all come from the same zod schemas the routes validate with.
 */
export function buildOpenApiDocument(
  routes: Record<RouteKey, RouteSpec>,
  info: { title: string; version: string; description?: string },
) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const [key, spec] of Object.entries(routes) as [RouteKey, RouteSpec][]) {
    const [method, expressPath] = splitRouteKey(key);
    const path = expressPath.replace(/:(\w+)/g, '{$1}');
    const status = String(spec.status ?? 200);
    const content: Record<string, unknown> = {
      'application/json': spec.response ? { schema: jsonSchema(spec.response, 'output') } : {},
    };
    for (const type of spec.produces ?? []) content[type] = { schema: { type: 'string' } };
    const responses: Record<string, unknown> = { [status]: { description: spec.summary, content } };
    for (const [code, description] of Object.entries(ERROR_STATUSES)) {
      if (code === '401' || code === '403') {
        if (!spec.minRole) continue;
      } else if (code === '422' && key !== 'POST /api/sweeps') continue;
      responses[code] = { $ref: `#/components/responses/E${code}`, description };
    }
    paths[path] ??= {};
    paths[path][method] = {
      operationId: key.replace(/[^A-Za-z0-9]+/g, '_').replace(/^_|_$/g, ''),
      summary: spec.summary,
      tags: [spec.tag],
      'x-min-role': spec.minRole,
      security: spec.minRole ? [{ bearerAuth: [] }] : [],
      parameters: [...parameters(spec.params, 'path'), ...parameters(spec.query, 'query')],
      ...(spec.body
        ? {
            requestBody: {
              required: true,
              content: { 'application/json': { schema: jsonSchema(spec.body, 'input') } },
            },
          }
        : {}),
      responses,
    };
  }
  const errorSchema = jsonSchema(errorResponse, 'output');
  return {
    openapi: '3.1.0',
    info,
    paths,
    components: {
      securitySchemes: { bearerAuth: { type: 'http', scheme: 'bearer', bearerFormat: 'JWT' } },
      schemas: { Error: errorSchema },
      responses: Object.fromEntries(
        Object.entries(ERROR_STATUSES).map(([code, description]) => [
          `E${code}`,
          {
            description,
            content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } },
          },
        ]),
      ),
    },
  };
}
