/*
 * Heater and cathode of an indirectly heated valve. The cathode temperature (as a fraction of
 * its temperature at nominal heater voltage) relaxes exponentially towards the heater voltage
 * ratio: time constant 5 s heating, 12 s cooling (simulated time). Emission follows the
 * temperature through a steep logistic curve, as oxide cathodes do: almost nothing for the
 * first 2-3 s, about 90 % at 7 s and full by about 15-20 s (common practice: indirectly heated
 * cathodes emit after about 10-20 s). A sound cathode barely notices a 10 % heater reduction;
 * a worn one has lost the reserve of emission and collapses, which is what the reduced-heater
 * test looks for.
 */
const HEAT_TAU_S = 5;
const COOL_TAU_S = 12;
const SOUND_MIDPOINT = 0.6;
const SOUND_WIDTH = 0.06;
const WORN_MIDPOINT = 0.9;
const WORN_WIDTH = 0.035;

/** Thermal state of the cathode; times are simulated ms. */
export class CathodeModel {
  private temperature = 0;
  private targetTemperature = 0;
  private sinceMs = 0;
  private heaterOnMs = 0;

  /** `nominalHeaterVolts` is the type's rated heater voltage, V. */
  constructor(private readonly nominalHeaterVolts: number) {}

  /** Applies a heater voltage (V; 0 = off) from `atMs` on. */
  setHeater(volts: number, atMs: number): void {
    this.settle(atMs);
    this.targetTemperature = Math.max(0, volts) / this.nominalHeaterVolts;
  }

  /** Cathode temperature at `atMs`, as a fraction of its temperature at nominal heater voltage. */
  temperatureAt(atMs: number): number {
    const dtS = Math.max(0, atMs - this.sinceMs) / 1000;
    const tau = this.targetTemperature > this.temperature ? HEAT_TAU_S : COOL_TAU_S;
    return (
      this.targetTemperature + (this.temperature - this.targetTemperature) * Math.exp(-dtS / tau)
    );
  }

  /** Emission at `atMs` as a fraction of a sound cathode's emission at nominal heater voltage. */
  emissionAt(atMs: number, worn: boolean): number {
    const t = this.temperatureAt(atMs);
    const full = logistic(1, SOUND_MIDPOINT, SOUND_WIDTH);
    return worn
      ? logistic(t, WORN_MIDPOINT, WORN_WIDTH) / full
      : logistic(t, SOUND_MIDPOINT, SOUND_WIDTH) / full;
  }

  /** Total time the heater has been on up to `atMs`, ms. */
  heaterOnMsAt(atMs: number): number {
    const running = this.targetTemperature > 0 ? Math.max(0, atMs - this.sinceMs) : 0;
    return this.heaterOnMs + running;
  }

  private settle(atMs: number): void {
    this.heaterOnMs = this.heaterOnMsAt(atMs);
    this.temperature = this.temperatureAt(atMs);
    this.sinceMs = Math.max(this.sinceMs, atMs);
  }
}

function logistic(x: number, midpoint: number, width: number): number {
  if (x <= 0) return 0;
  return 1 / (1 + Math.exp(-(x - midpoint) / width));
}
