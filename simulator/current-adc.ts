import type { SeededRandom } from './seeded-random';

/** Full-scale values of the autoranging current ranges, mA (smallest first). */
export const CURRENT_RANGES_MILLIAMPS = [2.5, 25, 250] as const;

/** Resolution of the converter: 12 bits. */
export const ADC_CODES = 4095;

/** One conversion of a current channel. */
export interface AdcReading {
  /** Reported current, mA (offset-corrected after zeroing, never negative). */
  milliamps: number;
  /** Whether the input was above the largest range (the converter saturated). */
  overRange: boolean;
}

/**
 * A current channel: a 12-bit unipolar converter with autoranging over three decade ranges
 * (so a 1 mA triode still reads to better than 1 uA), a small input offset of its own, and
 * the correction learned by zeroing. One range over the full 250 mA would make a small-signal
 * triode's curves steps of 61 uA, which no real tracer would accept.
 */
export class CurrentAdc {
  private correctionMilliamps = 0;

  /** `offsetMilliamps` is the channel's own zero error, mA. */
  constructor(private readonly offsetMilliamps: number) {}

  /** Converts a true current (mA) into a reading. */
  convert(trueMilliamps: number): AdcReading {
    const raw = Math.max(0, trueMilliamps + this.offsetMilliamps);
    const top = CURRENT_RANGES_MILLIAMPS[CURRENT_RANGES_MILLIAMPS.length - 1];
    const range = CURRENT_RANGES_MILLIAMPS.find((r) => raw <= r) ?? top;
    const code = Math.min(ADC_CODES, Math.round((raw / range) * ADC_CODES));
    const milliamps = Math.max(0, (code * range) / ADC_CODES - this.correctionMilliamps);
    return { milliamps, overRange: raw > top };
  }

  /** Zeroes the channel with no current flowing (plus noise); returns the offset found, mA. */
  zero(noise: SeededRandom | null, noiseMilliamps: number): number {
    this.correctionMilliamps = 0;
    const seen = this.convert(noise ? noise.gaussian() * noiseMilliamps : 0).milliamps;
    this.correctionMilliamps = seen;
    return seen;
  }
}
