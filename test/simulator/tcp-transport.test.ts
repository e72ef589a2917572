import { afterEach, describe, expect, it } from 'vitest';
import { defaultPlan, findValveType } from '../../shared/catalog/valve-types';
import { plannedPointCount } from '../../shared/domain/sweep';
import { SimulatedTracer, type SimulatedTracerOptions } from '../../simulator/simulated-tracer';
import { TcpTransport } from '../../simulator/tcp-transport';
import { tcpClient, type TcpClient } from './tcp-client';
import { line, smallTriodePlan, sweepLine } from './test-host';

const SPEED = 1000;
const running: Array<{ tracer: SimulatedTracer; transport: TcpTransport; clients: TcpClient[] }> =
  [];

async function serve(options: Partial<SimulatedTracerOptions> = {}) {
  const tracer = new SimulatedTracer({ valve: '12AX7#1', speed: SPEED, ...options });
  const transport = new TcpTransport(tracer, { port: 0 });
  await transport.start();
  const entry = { tracer, transport, clients: [] as TcpClient[] };
  running.push(entry);
  const client = async () => {
    const c = await tcpClient(transport.port);
    entry.clients.push(c);
    return c;
  };
  return { tracer, transport, client };
}

/** Sends KAL every 100 ms, as a live host does, until stopped. */
function keepAlive(c: TcpClient): () => void {
  const timer = setInterval(() => c.send(line({ type: 'keepalive' })), 100);
  return () => clearInterval(timer);
}

afterEach(async () => {
  for (const r of running.splice(0)) {
    for (const c of r.clients) c.end();
    r.tracer.shutdown();
    await r.transport.stop();
  }
});

describe('TcpTransport', () => {
  it('answers the handshake over a real socket', async () => {
    const { client } = await serve();
    const c = await client();
    c.send(line({ type: 'identify' }));
    const caps = await c.host.waitFor('caps');
    expect(c.host.of('ident')[0]).toMatchObject({ protocolVersion: 1 });
    expect(caps.caps).toMatchObject({ vaMaxVolts: 500, iaMaxMilliamps: 250, watchdogMs: 3000 });
  });

  it('runs a complete 12AX7 anode sweep with every planned point and END DONE', async () => {
    const { client } = await serve();
    const c = await client();
    const stop = keepAlive(c);
    const plan = smallTriodePlan();
    c.send(sweepLine(41, plan));
    const end = await c.host.waitFor('end');
    stop();
    const points = c.host.of('point');
    expect(end).toEqual({
      type: 'end',
      sweepId: 41,
      reason: 'complete',
      count: plannedPointCount(plan),
    });
    expect(points.map((p) => p.seq)).toEqual(points.map((_, i) => i));
    expect(points.length).toBe(plannedPointCount(plan));
  });

  it('runs the catalog default plan of a 12AX7, curves clipped at its limits', async () => {
    const { client } = await serve();
    const c = await client();
    const stop = keepAlive(c);
    const plan = defaultPlan(findValveType('12AX7')!);
    c.send(sweepLine(42, plan));
    const end = await c.host.waitFor('end');
    stop();
    const points = c.host.of('point');
    expect(end).toMatchObject({ reason: 'complete', count: points.length });
    expect(points.map((p) => p.seq)).toEqual(points.map((_, i) => i));
    expect(new Set(points.map((p) => p.curve)).size).toBe(plan.vg1Volts.length);
    expect(points.every((p) => p.iaMilliamps < plan.iaTripMilliamps)).toBe(true);
    expect(points.length).toBeLessThan(plannedPointCount(plan));
  });

  it('gives the same readings for the same seed and different ones for another seed', async () => {
    const sweepOf = async (valve: string) => {
      const { client } = await serve({ valve });
      const c = await client();
      const stop = keepAlive(c);
      c.send(sweepLine(1, smallTriodePlan()));
      await c.host.waitFor('end');
      stop();
      return c.host.of('point').map((p) => p.iaMilliamps);
    };
    const a = await sweepOf('12AX7#11');
    const again = await sweepOf('12AX7#11');
    const other = await sweepOf('12AX7#12');
    expect(again).toEqual(a);
    const differing = a.filter((ia, i) => ia > 0.2 && Math.abs(other[i] - ia) / ia > 0.01);
    expect(differing.length).toBeGreaterThan(5);
  });

  it('lets a new connection replace the old one', async () => {
    const { client, transport } = await serve();
    const first = await client();
    const second = await client();
    await first.closed;
    second.send(line({ type: 'identify' }));
    await second.host.waitFor('caps');
    expect(transport.stats()).toMatchObject({ connections: 2, replaced: 1, connected: true });
  });

  it('closes the socket on unplug, refuses connections until plugged back', async () => {
    const { client, tracer, transport } = await serve();
    const c = await client();
    tracer.setFault('unplug');
    await c.closed;
    const refused = await client();
    await refused.closed;
    expect(transport.stats().refused).toBe(1);
    tracer.setFault('none');
    const back = await client();
    back.send(line({ type: 'identify' }));
    await back.host.waitFor('caps');
  });

  it('fires the watchdog when the host goes quiet: END WDT and ERR E40', async () => {
    const { client } = await serve({ watchdogMs: 200 });
    const c = await client();
    c.send(sweepLine(43, smallTriodePlan({ warmupSeconds: 600 })));
    const end = await c.host.waitFor('end');
    expect(end).toMatchObject({ sweepId: 43, reason: 'link-lost', count: 0 });
    expect((await c.host.waitFor('error')).code).toBe('E40');
  });
});
