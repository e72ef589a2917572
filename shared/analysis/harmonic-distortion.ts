/**
 * Harmonic distortion from anode currents at a few grid drives along a load line, in %.
 * Three-point: from the currents at drive +1, 0, -1 of the peak (RCA manuals; Langford-Smith,
 * Radiotron Designer's Handbook, 4th ed., 1953). Five-point: Espley, Proc. IRE 21, 1933, from
 * drives +1, +1/2, 0, -1/2, -1 (exact for a dynamic characteristic up to fourth degree).
 */

/** Anode currents along a load line at grid drives +1, +1/2, 0, -1/2, -1 of the peak, mA. */
export interface DriveCurrents {
  /** At the most positive grid (drive +1), mA. */
  maxMilliamps: number;
  /** At drive +1/2, mA. */
  xMilliamps: number;
  /** At the operating point (drive 0), mA. */
  zeroMilliamps: number;
  /** At drive -1/2, mA. */
  yMilliamps: number;
  /** At the most negative grid (drive -1), mA. */
  minMilliamps: number;
}

/** Second harmonic by the three-point method, %: |Imax + Imin - 2·Io| / (2·(Imax - Imin)). */
export function threePointSecondHarmonicPercent(
  maxMilliamps: number,
  zeroMilliamps: number,
  minMilliamps: number,
): number {
  return (
    (100 * (maxMilliamps + minMilliamps - 2 * zeroMilliamps)) / (2 * (maxMilliamps - minMilliamps))
  );
}

/**
 * Harmonic amplitudes B1..B4 (mA, signed) and distortion D2..D4 (|Bn/B1| in %) by the
 * five-point method.
 */
export function fivePointDistortion(c: DriveCurrents): {
  b1Milliamps: number;
  b2Milliamps: number;
  b3Milliamps: number;
  b4Milliamps: number;
  d2Percent: number;
  d3Percent: number;
  d4Percent: number;
} {
  const {
    maxMilliamps: imax,
    xMilliamps: ix,
    zeroMilliamps: io,
    yMilliamps: iy,
    minMilliamps: imin,
  } = c;
  const b1 = (imax - imin + ix - iy) / 3;
  const b2 = (imax + imin - 2 * io) / 4;
  const b3 = (imax - imin - 2 * (ix - iy)) / 6;
  const b4 = (imax + imin - 4 * (ix + iy) + 6 * io) / 12;
  return {
    b1Milliamps: b1,
    b2Milliamps: b2,
    b3Milliamps: b3,
    b4Milliamps: b4,
    d2Percent: (100 * Math.abs(b2)) / Math.abs(b1),
    d3Percent: (100 * Math.abs(b3)) / Math.abs(b1),
    d4Percent: (100 * Math.abs(b4)) / Math.abs(b1),
  };
}
