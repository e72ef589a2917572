import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { z } from 'zod';
import { FAULT_NAMES } from './fault-name';
import type { SimulatedTracer } from './simulated-tracer';
import { TracerBusyError } from './tracer-busy-error';
import type { TransportStats } from './tcp-transport';
import { makeValveSpec } from './valve-spec';

/** Options of the control server. */
export interface ControlServerOptions {
  /** The tracer to control. */
  tracer: SimulatedTracer;
  /** Transport figures to include in GET /state. */
  transport?: { stats(): TransportStats };
  /** TCP port; 0 picks a free one. */
  port: number;
  /** Address to listen on; default 127.0.0.1. */
  host?: string;
}

/** A listening control server. */
export interface ControlServer {
  /** "HOST:PORT" it listens on. */
  address: string;
  /** Stops listening. */
  close(): Promise<void>;
}

const MAX_BODY_BYTES = 16 * 1024;

const SocketBody = z.object({
  type: z.string().min(1, 'type is required, e.g. "12AX7"'),
  seed: z.number().int().min(0).max(0xffffffff),
});
const FaultBody = z.object({ fault: z.enum(FAULT_NAMES) });

class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
  }
}

/**
 * Runtime control of the simulated tracer over HTTP with JSON bodies (node:http; the API has
 * three routes, so a framework would add nothing):
 * GET /state, PUT /socket {type, seed}, PUT /fault {fault}. Errors answer
 * `{ error: { code, message, fields? } }` with a 4xx status.
 */
export function startControlServer(options: ControlServerOptions): Promise<ControlServer> {
  const { tracer } = options;
  const state = () => ({ ...tracer.snapshot(), transport: options.transport?.stats() ?? null });

  const route = async (req: IncomingMessage): Promise<unknown> => {
    const path = new URL(req.url ?? '/', 'http://control').pathname;
    if (path === '/state') {
      allow(req, 'GET');
      return state();
    }
    if (path === '/socket') {
      allow(req, 'PUT');
      const body = parse(SocketBody, await readJson(req));
      let spec;
      try {
        spec = makeValveSpec(body.type, body.seed);
      } catch (e) {
        throw new HttpError(400, 'bad-valve', (e as Error).message, { type: (e as Error).message });
      }
      try {
        tracer.setValve(spec);
      } catch (e) {
        if (e instanceof TracerBusyError) throw new HttpError(409, 'busy', e.message);
        throw e;
      }
      return state();
    }
    if (path === '/fault') {
      allow(req, 'PUT');
      tracer.setFault(parse(FaultBody, await readJson(req)).fault);
      return state();
    }
    throw new HttpError(
      404,
      'not-found',
      `no route ${path}; routes: GET /state, PUT /socket, PUT /fault`,
    );
  };

  const handle = (req: IncomingMessage, res: ServerResponse) => {
    route(req).then(
      (body) => send(res, 200, body),
      (e: unknown) => {
        if (e instanceof HttpError) {
          send(res, e.status, { error: { code: e.code, message: e.message, fields: e.fields } });
        } else {
          send(res, 500, { error: { code: 'internal', message: (e as Error).message } });
        }
      },
    );
  };

  const server = createServer(handle);
  const host = options.host ?? '127.0.0.1';
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, host, () => {
      server.off('error', reject);
      const port = (server.address() as AddressInfo).port;
      resolve({
        address: `${host}:${port}`,
        close: () =>
          new Promise<void>((done) => {
            server.closeAllConnections();
            server.close(() => done());
          }),
      });
    });
  });
}

function allow(req: IncomingMessage, method: string): void {
  if (req.method !== method) {
    throw new HttpError(405, 'method-not-allowed', `${req.url} accepts ${method} only`);
  }
}

function parse<T>(schema: z.ZodType<T>, value: unknown): T {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const fields: Record<string, string> = {};
  for (const issue of result.error.issues) fields[issue.path.join('.') || 'body'] = issue.message;
  const message = Object.entries(fields)
    .map(([field, why]) => `${field}: ${why}`)
    .join('; ');
  throw new HttpError(400, 'bad-request', message, fields);
}

async function readJson(req: IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > MAX_BODY_BYTES)
      throw new HttpError(413, 'too-large', `body over ${MAX_BODY_BYTES} bytes`);
    chunks.push(chunk as Buffer);
  }
  const text = Buffer.concat(chunks).toString('utf8');
  try {
    return JSON.parse(text);
  } catch {
    throw new HttpError(400, 'bad-json', 'body must be a JSON object, e.g. {"fault":"gas"}');
  }
}

function send(res: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    'content-type': 'application/json',
    'content-length': Buffer.byteLength(text),
  });
  res.end(text);
}
