import { generateTidewater } from "./fleet";
import { createRandom } from "./random";
import { generateNorthgate } from "./shop";
import type { DemoDataset } from "./types";
import { createVinFactory } from "./vehicles";

/** The seed the demo ships with; any other seed gives another, equally plausible, demo. */
export const DEFAULT_DEMO_SEED = 20231001;

/**
 * Generates the whole demo in memory, without touching a database: the same seed always gives
 * the same dataset, down to the last character.
 */
export function buildDemoDataset(seed: number = DEFAULT_DEMO_SEED): DemoDataset {
  const rng = createRandom(seed);
  // One VIN factory for both organisations keeps every VIN in the demo unique.
  const makeVin = createVinFactory(rng.fork("vin"));
  return {
    seed,
    organisations: [
      generateTidewater(rng.fork("tidewater"), makeVin),
      generateNorthgate(rng.fork("northgate"), makeVin),
    ],
  };
}
