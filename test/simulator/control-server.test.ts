import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { startControlServer, type ControlServer } from '../../simulator/control-server';
import { SimulatedTracer } from '../../simulator/simulated-tracer';
import { TcpTransport } from '../../simulator/tcp-transport';
import { tcpClient } from './tcp-client';
import { line, smallTriodePlan, sweepLine } from './test-host';

let tracer: SimulatedTracer;
let transport: TcpTransport;
let control: ControlServer;

beforeEach(async () => {
  tracer = new SimulatedTracer({ valve: '12AX7#1', speed: 1000 });
  transport = new TcpTransport(tracer, { port: 0 });
  await transport.start();
  control = await startControlServer({ tracer, transport, port: 0 });
});

afterEach(async () => {
  tracer.shutdown();
  await Promise.all([transport.stop(), control.close()]);
});

async function call(method: string, path: string, body?: unknown) {
  const res = await fetch(`http://${control.address}${path}`, {
    method,
    headers: { 'content-type': 'application/json' },
    body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
  });
  // Responses are read field by field in many shapes; the tests check them at run time.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  return { status: res.status, body: (await res.json()) as Record<string, any> };
}

describe('control server', () => {
  it('reports valve, fault, state and host line counters on GET /state', async () => {
    const c = await tcpClient(transport.port);
    c.send(line({ type: 'identify' }));
    c.send('$IDN*00\r\n');
    await c.host.waitFor('caps');
    const { status, body } = await call('GET', '/state');
    expect(status).toBe(200);
    expect(body).toMatchObject({
      valve: '12AX7#1',
      valveType: '12AX7',
      seed: 1,
      fault: 'none',
      state: 'idle',
    });
    expect(body.counters.hostLines).toMatchObject({ accepted: 1, badChecksum: 1, dropped: 1 });
    expect(body.counters.commands.identify).toBe(1);
    expect(body.transport).toMatchObject({ kind: 'tcp', connected: true, connections: 1 });
    c.end();
  });

  it('puts another valve in the socket on PUT /socket', async () => {
    const { status, body } = await call('PUT', '/socket', { type: 'EL34', seed: 4 });
    expect(status).toBe(200);
    expect(body).toMatchObject({ valve: 'EL34#4', valveType: 'EL34', seed: 4 });
  });

  it('refuses a bad socket body with 400 and a clear message', async () => {
    const noModel = await call('PUT', '/socket', { type: 'EF86', seed: 1 });
    expect(noModel.status).toBe(400);
    expect(noModel.body.error.message).toMatch(/EF86 has no published model/);
    const badSeed = await call('PUT', '/socket', { type: '12AX7', seed: -3 });
    expect(badSeed.status).toBe(400);
    expect(badSeed.body.error.fields.seed).toBeTruthy();
    const notJson = await call('PUT', '/socket', '{type: 12AX7');
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.code).toBe('bad-json');
    expect((await call('GET', '/state')).body.valve).toBe('12AX7#1');
  });

  it('refuses to change the valve while a sweep runs', async () => {
    const c = await tcpClient(transport.port);
    c.send(sweepLine(1, smallTriodePlan({ warmupSeconds: 600 })));
    await c.host.waitFor('ack');
    const { status, body } = await call('PUT', '/socket', { type: '12AU7', seed: 2 });
    expect(status).toBe(409);
    expect(body.error.message).toMatch(/abort/);
    c.end();
  });

  it('sets and clears a fault on PUT /fault and refuses unknown names', async () => {
    expect((await call('PUT', '/fault', { fault: 'gas' })).body.fault).toBe('gas');
    const bad = await call('PUT', '/fault', { fault: 'smoke' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/fault/);
    expect((await call('PUT', '/fault', { fault: 'none' })).body.fault).toBe('none');
  });

  it('answers 404 for unknown paths and 405 for wrong methods', async () => {
    expect((await call('GET', '/nothing')).status).toBe(404);
    expect((await call('POST', '/state', {})).status).toBe(405);
  });
});
