import type { ElectrodePair } from '../shared/protocol';
import { CathodeModel } from './cathode-model';
import { CurrentAdc } from './current-adc';
import type { FaultName } from './fault-name';
import { SeededRandom } from './seeded-random';
import type { SimulatedValve } from './simulated-valve';

/** One reading of the socket's current channels. */
export interface SocketReading {
  /** Anode current as the converter reports it, mA. */
  iaMilliamps: number;
  /** Screen current as the converter reports it, mA (0 without a screen or screen supply). */
  ig2Milliamps: number;
  /** Whether the anode current was beyond the largest measuring range. */
  overRange: boolean;
  /**
   * Grid-1 current, uA; negative is reverse (positive-ion) current as a gassy valve draws. The
   * core protocol has no field for it; the grid-current check (GAS) reports it.
   */
  gridCurrentMicroamps: number;
  /** Cathode emission at the reading, fraction of a sound cathode's at nominal heater. */
  emission: number;
}

/** Relative gaussian noise on a current reading (standard deviation). */
const NOISE_RELATIVE = 0.0015;
/** Noise floor of a current channel (standard deviation), mA. */
export const NOISE_FLOOR_MILLIAMPS = 0.0003;
/** Resistance of the simulated anode-cathode short, ohm. */
const SHORT_OHMS = 5;
/** Emission left by the low-emission fault. */
const LOW_EMISSION_FACTOR = 0.5;
/** Share of readings that lose contact under the intermittent fault. */
const DROPOUT_PROBABILITY = 0.08;
/** Ion current of the gas fault at the type's reference operating current, uA, when fresh. */
const GAS_MICROAMPS_AT_REFERENCE = 0.5;
/** Heater-on time over which the gas ion current doubles (gas evolves from warm parts), s. */
const GAS_DRIFT_SECONDS = 120;
/** Largest growth of the ion current by drift. */
const GAS_DRIFT_MAX = 3;
/** Anode voltage below which electrons cannot ionise the residual gas, V. */
const IONISATION_VOLTS = 15;
/**
 * Series resistor in the simulated grid-1 feed, ohm. A positive-ion current through it lifts
 * the grid above its set voltage, which is why a gassy valve draws more anode current.
 */
export const GRID_FEED_OHMS = 47000;

/** Reverse grid current of a sound valve at the type's reference current, uA (a few nA). */
const SOUND_GRID_MICROAMPS = 0.003;
/** Noise of the grid-current channel (standard deviation), uA. */
const GRID_NOISE_MICROAMPS = 0.0005;
/** Current-limiting resistor of the leakage supply, ohm: a dead short draws V / 100 kOhm. */
export const LEAKAGE_SERIES_OHMS = 100_000;
/** Full scale of the leakage meter, uA; beyond it the reading is over range. */
export const LEAKAGE_RANGE_MICROAMPS = 500;
/** Heater-cathode insulation under the leaky-heater fault, ohm. */
const LEAKY_HEATER_OHMS = 2e6;
/** Insulation between socket contacts with no electrode behind them (a triode's screen), ohm. */
const SOCKET_INSULATION_OHMS = 1e11;
/** Noise of the leakage meter: floor (standard deviation), uA, and share of the reading. */
const LEAKAGE_NOISE_MICROAMPS = 0.001;
const LEAKAGE_NOISE_RELATIVE = 0.005;

/** One reading of the leakage meter. */
export interface LeakageMeterReading {
  /** Current, uA (full scale when over range). */
  microamps: number;
  /** Whether the current was beyond the meter's range. */
  overRange: boolean;
}

/** Options of a ValveSocket. */
export interface ValveSocketOptions {
  /** Whether readings carry gaussian noise; default true. */
  noise?: boolean;
  /** Device serial, which seeds the converters' own zero offsets. */
  deviceSerial: string;
}

/**
 * The socket of the simulated tracer with the valve in it: valve model, cathode, injected
 * fault, noise and the current converters. Times are simulated ms.
 */
export class ValveSocket {
  /** Anode current channel. */
  readonly iaAdc: CurrentAdc;
  /** Screen current channel. */
  readonly ig2Adc: CurrentAdc;
  private faultName: FaultName = 'none';
  private current: SimulatedValve;
  private cathode: CathodeModel;
  private noise: SeededRandom;
  private dropouts: SeededRandom;
  private gridNoise: SeededRandom;
  private heaterVolts = 0;
  private readonly noisy: boolean;

  constructor(valve: SimulatedValve, options: ValveSocketOptions) {
    this.noisy = options.noise ?? true;
    const offsets = SeededRandom.fromText(`${options.deviceSerial}/offsets`);
    this.iaAdc = new CurrentAdc(0.0004 + 0.0004 * offsets.next());
    this.ig2Adc = new CurrentAdc(0.0002 + 0.0004 * offsets.next());
    this.current = valve;
    this.cathode = new CathodeModel(valve.type.heaterVolts);
    this.noise = SeededRandom.fromText(`${valve.label}/noise`);
    this.dropouts = SeededRandom.fromText(`${valve.label}/dropouts`);
    this.gridNoise = SeededRandom.fromText(`${valve.label}/grid-noise`);
  }

  /** Fault in effect. */
  get fault(): FaultName {
    return this.faultName;
  }

  /** Puts a fault into effect from `atMs` on ('none' clears). */
  setFault(fault: FaultName, atMs: number): void {
    this.faultName = fault;
    this.setHeater(this.heaterVolts, atMs);
  }

  /** The valve in the socket. */
  get valve(): SimulatedValve {
    return this.current;
  }

  /** Puts another valve in the socket at `atMs`; it starts cold, the heater supply stays set. */
  insert(valve: SimulatedValve, atMs: number): void {
    this.current = valve;
    this.cathode = new CathodeModel(valve.type.heaterVolts);
    this.setHeater(this.heaterVolts, atMs);
    this.noise = SeededRandom.fromText(`${valve.label}/noise`);
    this.dropouts = SeededRandom.fromText(`${valve.label}/dropouts`);
    this.gridNoise = SeededRandom.fromText(`${valve.label}/grid-noise`);
  }

  /** Sets the heater supply (V; 0 = off) from `atMs` on. An open heater never warms. */
  setHeater(volts: number, atMs: number): void {
    this.heaterVolts = volts;
    this.cathode.setHeater(this.faultName === 'open-heater' ? 0 : volts, atMs);
  }

  /** Whether heater current flows with the heater on (false under the open-heater fault). */
  heaterCurrentFlows(): boolean {
    return this.fault !== 'open-heater';
  }

  /** Emission at `atMs`, fraction of a sound cathode's at nominal heater voltage. */
  emissionAt(atMs: number): number {
    const e = this.cathode.emissionAt(atMs, this.fault === 'worn-cathode');
    return this.fault === 'low-emission' ? e * LOW_EMISSION_FACTOR : e;
  }

  /**
   * Reads a section (0-based; 0 = the data sheet's section 1) at the given electrode voltages
   * (V) at `atMs`. A section the valve does not have is an empty socket position: no current.
   */
  read(
    vaVolts: number,
    vg1Volts: number,
    vg2Volts: number,
    atMs: number,
    section = 0,
  ): SocketReading {
    const emission = this.emissionAt(atMs);
    const present = section < this.current.sections.length;
    const at = (vg1: number) => {
      if (!present) return { ia: 0, ig2: 0 };
      const c = this.current.currents(section, vaVolts, vg1, vg2Volts);
      return { ia: c.iaMilliamps * emission, ig2: c.ig2Milliamps * emission };
    };
    let c = at(vg1Volts);
    let ionMicroamps = 0;
    if (this.fault === 'gas') {
      // The ion current depends on the anode current it lifts, so iterate to the fixed point;
      // the loop gain is far below 1 for the catalog types, four rounds are plenty.
      for (let i = 0; i < 4; i++) {
        ionMicroamps = this.ionMicroamps(c.ia, vaVolts, atMs);
        c = at(vg1Volts + ionMicroamps * 1e-6 * GRID_FEED_OHMS);
      }
    }
    let ia = c.ia;
    let ig2 = c.ig2;
    if (this.fault === 'short') ia += (Math.max(0, vaVolts) / SHORT_OHMS) * 1000;
    if (this.fault === 'intermittent' && this.dropouts.next() < DROPOUT_PROBABILITY) {
      const left = this.dropouts.next() * 0.05;
      ia *= left;
      ig2 *= left;
    }
    if (this.noisy) {
      ia += this.noise.gaussian() * (NOISE_RELATIVE * ia + NOISE_FLOOR_MILLIAMPS);
      ig2 += this.noise.gaussian() * (NOISE_RELATIVE * ig2 + NOISE_FLOOR_MILLIAMPS);
    }
    const iaReading = this.iaAdc.convert(ia);
    const screenLive = this.current.hasScreen && vg2Volts > 0;
    return {
      iaMilliamps: iaReading.milliamps,
      ig2Milliamps: screenLive ? this.ig2Adc.convert(ig2).milliamps : 0,
      overRange: iaReading.overRange,
      gridCurrentMicroamps: this.gridMicroamps(c.ia, ionMicroamps),
      emission,
    };
  }

  /**
   * Reads the valve as a diode: grid 1 (and the screen of a pentode) strapped to the anode, all
   * at `vaVolts`; the current is the whole cathode current, mA, through the anode channel.
   */
  readStrapped(vaVolts: number, atMs: number): { milliamps: number; overRange: boolean } {
    const emission = this.emissionAt(atMs);
    const c = this.current.currents(0, vaVolts, vaVolts, this.current.hasScreen ? vaVolts : 0);
    let ik = (c.iaMilliamps + c.ig2Milliamps) * emission;
    if (this.fault === 'short') ik += (Math.max(0, vaVolts) / SHORT_OHMS) * 1000;
    if (this.noisy) ik += this.noise.gaussian() * (NOISE_RELATIVE * ik + NOISE_FLOOR_MILLIAMPS);
    return this.iaAdc.convert(ik);
  }

  /**
   * Reads the leakage current between two electrodes with `volts` applied through the leakage
   * supply's current-limiting resistor. A sound valve's insulation is 0.5-5 GOhm (tens of nA at
   * 100 V), different for each valve and pair; the short fault puts 5 Ohm between anode and
   * cathode, the leaky-heater fault 2 MOhm between heater and cathode.
   */
  readLeakage(pair: ElectrodePair, volts: number): LeakageMeterReading {
    const ohms = this.insulationOhms(pair);
    let microamps = (Math.max(0, volts) / (LEAKAGE_SERIES_OHMS + ohms)) * 1e6;
    if (this.noisy) {
      const sd = LEAKAGE_NOISE_MICROAMPS + LEAKAGE_NOISE_RELATIVE * microamps;
      microamps += this.noise.gaussian() * sd;
    }
    if (microamps > LEAKAGE_RANGE_MICROAMPS) {
      return { microamps: LEAKAGE_RANGE_MICROAMPS, overRange: true };
    }
    return { microamps: Math.max(0, Math.round(microamps * 1e4) / 1e4), overRange: false };
  }

  /** Zeroes both channels (outputs must be off); returns the offsets found, mA. */
  zero(): { iaMilliamps: number; ig2Milliamps: number } {
    const noise = this.noisy ? this.noise : null;
    return {
      iaMilliamps: this.iaAdc.zero(noise, NOISE_FLOOR_MILLIAMPS),
      ig2Milliamps: this.ig2Adc.zero(noise, NOISE_FLOOR_MILLIAMPS),
    };
  }

  /** Insulation resistance between a pair of electrodes, ohm. */
  private insulationOhms(pair: ElectrodePair): number {
    if (this.fault === 'short' && pair === 'anode-cathode') return SHORT_OHMS;
    if (this.fault === 'leaky-heater' && pair === 'heater-cathode') return LEAKY_HEATER_OHMS;
    if (pair.startsWith('screen') && !this.current.hasScreen) return SOCKET_INSULATION_OHMS;
    const u = SeededRandom.fromText(`${this.current.label}/insulation/${pair}`).next();
    // Hot heater-cathode insulation is the weakest of a sound valve: 0.5-2 GOhm; others 1-5.
    return pair === 'heater-cathode' ? 10 ** (8.7 + 0.6 * u) : 10 ** (9 + 0.7 * u);
  }

  /* Grid-1 current: a sound valve's few nA of reverse current, the gas fault's ion current, and
   * the channel's noise, resolved to 0.1 nA. */
  private gridMicroamps(iaMilliamps: number, ionMicroamps: number): number {
    const reference = this.current.type.operatingPoints[0].iaMilliamps;
    let ig1 = -SOUND_GRID_MICROAMPS * (iaMilliamps / reference) - ionMicroamps;
    if (this.noisy) ig1 += this.gridNoise.gaussian() * GRID_NOISE_MICROAMPS;
    return Math.round(ig1 * 1e4) / 1e4;
  }

  private ionMicroamps(iaMilliamps: number, vaVolts: number, atMs: number): number {
    if (vaVolts <= IONISATION_VOLTS) return 0;
    const reference = this.current.type.operatingPoints[0].iaMilliamps;
    const hotSeconds = this.cathode.heaterOnMsAt(atMs) / 1000;
    const drift = Math.min(GAS_DRIFT_MAX, 1 + hotSeconds / GAS_DRIFT_SECONDS);
    const ionisation = 1 - Math.exp(-(vaVolts - IONISATION_VOLTS) / 30);
    return GAS_MICROAMPS_AT_REFERENCE * drift * ionisation * (iaMilliamps / reference);
  }
}
