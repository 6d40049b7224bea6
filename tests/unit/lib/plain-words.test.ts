import { describe, expect, test } from "vitest";
import {
  describeExpected,
  describeRate,
  describeRatio,
  describeShare,
  describeWearRatio,
  faultName,
  formatConfidence,
  formatPercent,
  formatProbability,
  intervalLabel,
} from "@/lib/plain-words";

// The wording is Recurra's own rule (issue on trustworthy numbers): count of denominator first,
// then the share, then "likely between"; no ∞, no exponent form, no slugs.
describe("plain words for figures", () => {
  test("a share reads count of denominator, percentage, likely range", () => {
    expect(
      describeShare({ count: 34, of: 89, lower: 0.2855, upper: 0.4907, noun: ["repair"] }),
    ).toBe("34 of 89 repairs (38%), likely between 29% and 49%");
    expect(
      describeShare({ count: 0, of: 0, lower: null, upper: null, noun: ["fix", "fixes"] }),
    ).toBe("no fixes yet");
    expect(describeShare({ count: 1, of: 1, lower: null, upper: null, noun: ["vehicle"] })).toBe(
      "1 of 1 vehicle (100%)",
    );
  });

  test("a ratio reads times the rest of the fleet, with its lower bound", () => {
    expect(describeRatio({ ratio: 6.02, lower: 5.2, upper: 7.1, events: 40 })).toBe(
      "about 6 times the rest of the fleet, at least 5.2 times",
    );
    expect(describeRatio({ ratio: 1.4, lower: 0.8, upper: 2.5, events: 9 })).toBe(
      "about 1.4 times the rest of the fleet; could be chance (likely between 0.8 and 2.5 times)",
    );
    expect(describeRatio({ ratio: 0.5, lower: 0.3, upper: 0.8, events: 9 })).toBe(
      "about half the rest of the fleet, at most 0.8 times",
    );
  });

  test("no ∞: a fault with no repairs in the rest of the fleet says so", () => {
    const text = describeRatio({ ratio: null, lower: 27.84, upper: null, events: 28 });
    expect(text).toBe(
      "no repairs of this in the rest of the fleet in this band, at least 28 times its rate",
    );
    expect(text).not.toMatch(/∞/);
    expect(describeRatio({ ratio: null, lower: null, upper: null, events: 0 })).toBe(
      "none here, and none in the rest of the fleet in this band",
    );
  });

  test("a rate reads its count, the distance driven in the organisation's unit, and the range", () => {
    expect(
      describeRate({
        events: 12,
        exposureMi: 340_000,
        ratePer10kMi: 0.353,
        lowerPer10kMi: 0.182,
        upperPer10kMi: 0.616,
        unit: "mi",
      }),
    ).toBe(
      "12 repairs in 340,000 mi driven: about 0.35 per 10,000 mi, likely between 0.18 and 0.62",
    );
    // 1 mi = 1.609344 km exactly (NIST SP 811 Appendix B).
    expect(
      describeRate({
        events: 1,
        exposureMi: 10_000,
        ratePer10kMi: 1,
        lowerPer10kMi: null,
        upperPer10kMi: null,
        unit: "km",
      }),
    ).toBe("1 repair in 16,093 km driven: about 0.62 per 10,000 km");
  });

  test("an expected count below one reads as a chance (Poisson, 1 − e^−λ)", () => {
    // 1 − e^−0.48 = 0.3812 (computed)
    expect(describeExpected({ expected: 0.48, noun: ["failure"] })).toBe(
      "about a 38% chance of a failure",
    );
    expect(describeExpected({ expected: 3.2, lower: 1.1, upper: 6.4, noun: ["failure"] })).toBe(
      "about 3.2 failures (likely 1.1 to 6.4)",
    );
    expect(describeExpected({ expected: 0, noun: ["failure"] })).toBe("no failures expected");
  });

  test("percentages, probabilities and confidence levels as people write them", () => {
    expect(formatPercent(0.004)).toBe("0.4%");
    expect(formatPercent(0.00001)).toBe("under 0.1%");
    expect(formatPercent(0.3846)).toBe("38%");
    expect(formatProbability(2.7e-38)).toBe("below 0.0001");
    expect(formatProbability(0.0421)).toBe("0.042");
    expect(formatProbability(0.0013)).toBe("0.0013");
    expect(formatConfidence(0.9)).toBe("90%");
    expect(intervalLabel(0.99)).toBe("99% interval");
  });

  test("faults by their names, never slugs", () => {
    expect(
      faultName({ componentSystem: "Power distribution", componentName: "Body ground strap" }),
    ).toBe("Power distribution → Body ground strap");
    expect(faultName({ dtc: "P0496", dtcDescription: "Purge flow while shut" })).toBe(
      "P0496 — Purge flow while shut",
    );
    expect(faultName({ faultKey: "component:power-distribution/body-ground" })).toBe(
      "Power distribution → Body ground",
    );
    expect(faultName({ faultKey: "all" })).toBe("All failures");
  });

  test("wear reads as wearing out sooner (or later) than on the rest of the fleet, without ∞", () => {
    expect(describeWearRatio({ ratio: 2.1, lower: 1.4, upper: 3.2, events: 20 })).toBe(
      "wears out sooner than on the rest of the fleet: about 2.1 times as often, at least 1.4 times",
    );
    expect(describeWearRatio({ ratio: 0.5, lower: 0.3, upper: 0.8, events: 9 })).toBe(
      "wears out later than on the rest of the fleet: about half as often, at most 0.8 times",
    );
    expect(describeWearRatio({ ratio: 1.2, lower: 0.8, upper: 1.9, events: 9 })).toBe(
      "may wear out sooner than on the rest of the fleet: about 1.2 times as often, but it could be chance (likely between 0.8 and 1.9 times)",
    );
    expect(describeWearRatio({ ratio: 1.02, lower: 0.7, upper: 1.5, events: 9 })).toBe(
      "wears out about as often as on the rest of the fleet (likely between 0.7 and 1.5 times)",
    );
    expect(describeWearRatio({ ratio: null, lower: 27.84, upper: null, events: 28 })).toBe(
      "no wear repairs of this in the rest of the fleet in this band, at least 28 times its rate",
    );
  });
});
