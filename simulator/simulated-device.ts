import type { DeviceCapabilities } from '../shared/domain/sweep';
import { PROTOCOL_VERSION, type DeviceExtensions } from '../shared/protocol';
import { GRID_FEED_OHMS } from './valve-socket';

/** Limits and identity the simulated tracer announces (the watchdog period is configurable). */
export const SIMULATED_DEVICE: Omit<DeviceCapabilities, 'watchdogMs'> = {
  protocolVersion: PROTOCOL_VERSION,
  model: 'EMB-SIM',
  serial: 'SIM-0001',
  firmware: '1.0',
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  vg1MinVolts: -100,
  vg1MaxVolts: 0,
  iaMaxMilliamps: 250,
  heaterMaxVolts: 13.2,
  heaterMaxAmps: 2,
  pulse: true,
};

/** Default watchdog period, wall-clock ms. */
export const DEFAULT_WATCHDOG_MS = 3000;
/** Conversion time of one reading, added to the plan's settling time, simulated ms. */
export const CONVERSION_MS = 4;
/** Time for the anode supply to return to the start voltage between curves, simulated ms. */
export const CURVE_RESET_MS = 20;
/** Heartbeat period, simulated ms. */
export const HEARTBEAT_MS = 1000;
/** Shortest heartbeat period in wall-clock ms, so high speeds do not flood the link. */
export const HEARTBEAT_MIN_WALL_MS = 50;
/** Longest heartbeat period in wall-clock ms, so a host's silence check holds at low speeds. */
export const HEARTBEAT_MAX_WALL_MS = 1000;
/** Anode voltage of the electrode check before the first reading, V. */
export const ELECTRODE_CHECK_VOLTS = 10;
/**
 * Over-range at or below this anode voltage is a short (E31). Above it the converter's
 * full-scale reading is reported and the plan's limits decide (it ends the curve): power
 * pentodes legitimately pass 250 mA from about 50 V at zero grid bias.
 */
export const SHORT_MAX_VOLTS = 20;

/** Optional functions the simulated tracer announces in its EXT answer. */
export const SIMULATED_EXTENSIONS: DeviceExtensions = {
  features: ['leakage', 'emission', 'grid-current', 'section-select'],
  gridFeedKiloohms: GRID_FEED_OHMS / 1000,
  leakageMaxVolts: 200,
};
/**
 * Highest voltage of the emission check (grids strapped to the anode), V: the strapped grids
 * draw heavy current, so the check is for low voltages only.
 */
export const STRAPPED_MAX_VOLTS = 60;
