import { assertNonNegativeFinite, assertPositiveFinite } from "./internal/validate";

/** A mileage band [from, to): index 0 is [0, width). */
export interface MileageBand {
  index: number;
  from: number;
  to: number;
}

/**
 * The mileage band an odometer reading falls in.
 *
 * Definition: bands are half-open intervals [k·width, (k + 1)·width), k = 0, 1, 2, …; a reading
 * on a boundary belongs to the band above it (30,000 with width 10,000 is band 3, 30,000–40,000).
 *
 * Method: k = floor(odometer / width), corrected by one where the division rounds across a
 * boundary (e.g. 0.3 / 0.1 = 2.9999999999999996).
 *
 * Source: common practice (fixed-width mileage bands for failure-rate tables).
 *
 * @param odometer finite ≥ 0
 * @param width band width, finite > 0
 * @throws Error "mileageBand: …" when odometer is not a finite number ≥ 0 or width is not a
 *   finite number > 0
 * @example
 * mileageBand(47_250, 10_000); // { index: 4, from: 40000, to: 50000 }
 */
export function mileageBand(odometer: number, width: number): MileageBand {
  const fn = "mileageBand";
  assertNonNegativeFinite(fn, "odometer", odometer);
  assertPositiveFinite(fn, "width", width);

  let index = Math.floor(odometer / width);
  if ((index + 1) * width <= odometer) index++;
  else if (index > 0 && index * width > odometer) index--;
  return { index, from: index * width, to: (index + 1) * width };
}
