import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

/** Two linked pseudo-terminals made by socat, which can be unplugged and plugged in again. */
export interface SocatPair {
  /** Device end (the fake tracer opens it). */
  readonly device: string;
  /** Host end (the bridge opens it). */
  readonly host: string;
  /** Stops socat: both ends vanish, as when a USB cable is pulled. */
  unplug(): Promise<void>;
  /** Starts socat again on the same paths. */
  plug(): Promise<void>;
}

/** Starts socat with two linked ptys in dir and waits until both paths exist. */
export async function openSocatPair(dir: string): Promise<SocatPair> {
  const device = join(dir, 'ttyA');
  const host = join(dir, 'ttyB');
  let socat: ChildProcess | null = null;
  const plug = async () => {
    const child = spawn(
      'socat',
      ['-d', '-d', `pty,raw,echo=0,link=${device}`, `pty,raw,echo=0,link=${host}`],
      { stdio: 'ignore' },
    );
    socat = child;
    const deadline = Date.now() + 5000;
    while (!(existsSync(device) && existsSync(host))) {
      if (Date.now() > deadline || child.exitCode !== null) {
        throw new Error('socat did not create the pty pair');
      }
      await new Promise((r) => setTimeout(r, 10));
    }
  };
  const unplug = () =>
    new Promise<void>((done) => {
      const child = socat;
      socat = null;
      if (!child || child.exitCode !== null) return done();
      child.once('exit', () => done());
      child.kill('SIGTERM');
    });
  await plug();
  return { device, host, plug, unplug };
}
