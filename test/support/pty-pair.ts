import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

/** A connected pair of pseudo-terminals made by socat: what one end writes, the other reads. */
export interface PtyPair {
  /** Path of the first end (the device side in our tests). */
  a: string;
  /** Path of the second end (the host side). */
  b: string;
  /** Stops socat; both paths disappear. */
  close(): Promise<void>;
}

/** Starts `socat` with two linked ptys in dir and waits until both links exist. */
export async function openPtyPair(dir: string): Promise<PtyPair> {
  const a = join(dir, 'ttyA');
  const b = join(dir, 'ttyB');
  const socat: ChildProcess = spawn('socat', ['-d', '-d', `pty,raw,echo=0,link=${a}`, `pty,raw,echo=0,link=${b}`], {
    stdio: 'ignore',
  });
  const deadline = Date.now() + 5000;
  while (!(existsSync(a) && existsSync(b))) {
    if (Date.now() > deadline || socat.exitCode !== null) throw new Error('socat did not create the pty pair');
    await new Promise((r) => setTimeout(r, 20));
  }
  return {
    a,
    b,
    close: () =>
      new Promise<void>((done) => {
        if (socat.exitCode !== null) return done();
        socat.once('exit', () => done());
        socat.kill('SIGTERM');
      }),
  };
}
