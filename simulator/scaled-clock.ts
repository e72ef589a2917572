import type { SimClock, SimTimer } from './sim-clock';

/** A SimClock on the wall clock, running `speed` times faster (speed 1 is real time). */
export class ScaledClock implements SimClock {
  private readonly startWallMs = performance.now();

  constructor(readonly speed = 1) {
    if (!Number.isFinite(speed) || speed <= 0) {
      throw new Error(`speed must be a positive number, got ${speed}`);
    }
  }

  now(): number {
    return (performance.now() - this.startWallMs) * this.speed;
  }

  setTimer(delayMs: number, fire: () => void): SimTimer {
    const handle = setTimeout(fire, Math.max(0, delayMs) / this.speed);
    return { cancel: () => clearTimeout(handle) };
  }
}
