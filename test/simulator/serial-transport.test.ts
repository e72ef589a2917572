import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SerialPort } from 'serialport';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { plannedPointCount } from '../../shared/domain/sweep';
import { SerialTransport } from '../../simulator/serial-transport';
import { SimulatedTracer } from '../../simulator/simulated-tracer';
import { line, smallTriodePlan, sweepLine, TestHost } from './test-host';

let dir: string;
let socat: ChildProcess;
let devicePath: string;
let hostPath: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'emberline-sim-serial-'));
  devicePath = join(dir, 'ttyA');
  hostPath = join(dir, 'ttyB');
  socat = spawn(
    'socat',
    ['-d', '-d', `pty,raw,echo=0,link=${devicePath}`, `pty,raw,echo=0,link=${hostPath}`],
    {
      stdio: 'ignore',
    },
  );
  const deadline = Date.now() + 5000;
  while (!(existsSync(devicePath) && existsSync(hostPath))) {
    if (Date.now() > deadline || socat.exitCode !== null) throw new Error('socat made no pty pair');
    await new Promise((r) => setTimeout(r, 20));
  }
});

afterAll(async () => {
  if (socat && socat.exitCode === null) {
    const exited = new Promise((r) => socat.once('exit', r));
    socat.kill('SIGTERM');
    await exited;
  }
  rmSync(dir, { recursive: true, force: true });
});

function openHost(): Promise<{ port: SerialPort; host: TestHost }> {
  const host = new TestHost();
  const port = new SerialPort({ path: hostPath, baudRate: 115200, autoOpen: false });
  return new Promise((resolve, reject) =>
    port.open((err) => {
      if (err) return reject(err);
      port.on('data', host.feed);
      resolve({ port, host });
    }),
  );
}

function close(port: SerialPort): Promise<void> {
  return new Promise((resolve) => (port.isOpen ? port.close(() => resolve()) : resolve()));
}

describe('SerialTransport', () => {
  it('runs the handshake and a sweep over a real pty pair, and falls silent on unplug', async () => {
    const tracer = new SimulatedTracer({ valve: '12AX7#1', speed: 1000 });
    const transport = new SerialTransport(tracer, { path: devicePath });
    expect(await transport.start()).toBe(devicePath);
    const { port, host } = await openHost();
    try {
      port.write(line({ type: 'identify' }));
      expect((await host.waitFor('caps')).caps.vaMaxVolts).toBe(500);

      const kal = setInterval(() => port.write(line({ type: 'keepalive' })), 100);
      const plan = smallTriodePlan();
      port.write(sweepLine(51, plan));
      const end = await host.waitFor('end');
      clearInterval(kal);
      expect(end).toEqual({
        type: 'end',
        sweepId: 51,
        reason: 'complete',
        count: plannedPointCount(plan),
      });
      expect(host.of('point').map((p) => p.seq)).toEqual([
        ...Array(plannedPointCount(plan)).keys(),
      ]);
      expect(host.decoder.reader.stats.badChecksum).toBe(0);

      tracer.setFault('unplug');
      await new Promise((r) => setTimeout(r, 100)); // lines already on their way still arrive
      const heard = host.messages.length;
      port.write(line({ type: 'identify' }));
      await new Promise((r) => setTimeout(r, 200));
      expect(host.messages.length).toBe(heard);
      expect(transport.stats().connected).toBe(true);

      tracer.setFault('none');
      port.write(line({ type: 'identify' }));
      await host.waitFor('caps', () => true, 5000, heard);
    } finally {
      tracer.shutdown();
      await close(port);
      await transport.stop();
    }
  });
});
