import { describe, expect, test } from "vitest";
import { patternSentence } from "@/components/vehicles/timeline-patterns";
import type { MatchedPattern } from "@/db/queries/vehicle-timeline";

const purge: MatchedPattern = {
  make: "Aurel",
  model: "Kestrel",
  cohortLabel: "K2",
  bandIndex: 6,
  bandFromMi: 150_000,
  bandToMi: 175_000,
  faultKey: "dtc:P0496",
  kind: "failure",
  dtc: "P0496",
  dtcDescription: "Purge flow seen while the purge valve should be shut",
  componentSlug: null,
  componentSystem: null,
  componentName: null,
  events: 14,
  exposureMi: 340_000,
  vehiclesAtRisk: 40,
  vehiclesAffected: 9,
  ratePer10k: 0.41,
  rateLower: 0.22,
  rateUpper: 0.69,
  rateRatio: 6.02,
  ratioLower: 5.2,
  ratioUpper: 7.1,
  pValue: 2.7e-38,
  qValue: 7.6e-7,
  isSignal: true,
  position: "inside",
  vehicleRepairs: 1,
  vehicleRepairsInBand: 1,
  vehicleFaultEvents: 0,
  hasHadFault: true,
};

const pads: MatchedPattern = {
  ...purge,
  faultKey: "component:brakes/front-pads",
  kind: "wear",
  dtc: null,
  dtcDescription: null,
  componentSlug: "brakes/front-pads",
  componentSystem: "Brakes",
  componentName: "Front pads",
  rateRatio: 2.1,
  ratioLower: 1.3,
  ratioUpper: 3.4,
};

describe("a matched pattern in words (vehicle timeline)", () => {
  test("a failure: the fault by name, the count over the distance, the ratio in words", () => {
    expect(patternSentence(purge, { unit: "mi", odometerMi: 160_000, confidenceLevel: 0.9 })).toBe(
      "Aurel Kestrel K2, 150,000–175,000 mi, P0496 — Purge flow seen while the purge valve should be shut: " +
        "14 repairs in 340,000 mi driven: about 0.41 per 10,000 mi, likely between 0.22 and 0.69; " +
        "about 6 times the rest of the fleet, at least 5.2 times — this vehicle is at 160,000 mi, inside the band.",
    );
  });

  test("wear reads as wearing out sooner, never as failing; distances in the organisation's unit", () => {
    const text = patternSentence(pads, { unit: "km", odometerMi: 160_000, confidenceLevel: 0.9 });
    expect(text).toContain("Brakes → Front pads: 14 replacements in 547,177 km driven");
    // 0.41 per 10,000 mi = 0.2548 per 10,000 km (1 mi = 1.609344 km, NIST SP 811 Appendix B).
    expect(text).toContain("about 0.25 per 10,000 km");
    expect(text).toContain(
      "wears out sooner than on the rest of the fleet (about 2.1 times the rest of the fleet, at least 1.3 times)",
    );
    expect(text).not.toMatch(/fail/i);
    expect(text).not.toMatch(/brakes\/front-pads/);
  });
});
