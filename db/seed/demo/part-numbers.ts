import { COMPONENTS, type ComponentSlug } from "../reference";
import { PART_FIT, PART_UNIT_CENTS } from "./faults";
import { MAKES, MODELS } from "./scenario";
import type { Vehicle } from "./vehicles";

/**
 * Invented part numbers: a fit tag (a generation such as "K2", a make tag such as "AU", or
 * "GN" for parts that fit anything) and a number derived from the component. The same part on
 * the same kind of vehicle always gets the same number, so the shop's stock list can match the
 * part numbers written on repair lines.
 */

const COMPONENT_INDEX = new Map<string, number>(COMPONENTS.map((c, i) => [c.slug, i]));

export type PartFit = {
  partNumber: string;
  fit: "generation" | "make" | "universal";
  fitsWhat: string;
};

export function findPartFit(slug: ComponentSlug, vehicle: Vehicle): PartFit {
  const fit = PART_FIT[slug] ?? "make";
  const number = 4000 + (COMPONENT_INDEX.get(slug) ?? 0) * 23;
  if (fit === "universal") return { partNumber: `GN-${number}`, fit, fitsWhat: "universal fit" };
  if (fit === "generation") {
    const tag = vehicle.generation?.label ?? `${MODELS[vehicle.model].vinModel}X`;
    const label = vehicle.generation
      ? `${vehicle.model} ${vehicle.generation.label}`
      : `${vehicle.model}, other years`;
    return { partNumber: `${tag}-${number}`, fit, fitsWhat: label };
  }
  return {
    partNumber: `${MAKES[vehicle.make].partTag}-${number}`,
    fit,
    fitsWhat: `${vehicle.make} models`,
  };
}

/** A small, stable string hash (FNV-1a), so a part's price does not depend on draw order. */
function hashOf(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

/** Cost price of one unit of a part, in integer cents: the component's typical price ±20%. */
export function findUnitCostCents(slug: ComponentSlug, partNumber: string): number {
  const spread = 0.8 + (hashOf(partNumber) % 41) / 100;
  return Math.round(PART_UNIT_CENTS[slug] * spread);
}
