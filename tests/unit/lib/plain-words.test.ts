import { describe, expect, test } from "vitest";
import {
  cellFigureRows,
  describeAgainstChance,
  describeExpected,
  describeOutlook,
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
    // 1 − e^−0.083 = 0.0796 (computed): "an 8%", not "a 8%"
    expect(describeExpected({ expected: 0.083, noun: ["failure"] })).toBe(
      "about an 8% chance of a failure",
    );
    expect(describeExpected({ expected: 0.0004, noun: ["failure"] })).toBe(
      "under a 0.1% chance of a failure",
    );
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

  test("an outlook below one keeps its range, as chances (1 − e^−λ, bound to bound)", () => {
    // 1 − e^−0.48 = 0.3812, 1 − e^−0.2 = 0.1813, 1 − e^−0.7 = 0.5034 (computed)
    expect(describeOutlook({ expected: 0.48, lower: 0.2, upper: 0.7, noun: ["failure"] })).toBe(
      "about a 38% chance of a failure, likely between 18% and 50%",
    );
    // From one up, and without a range, it reads as describeExpected.
    expect(describeOutlook({ expected: 3.2, lower: 1.1, upper: 6.4, noun: ["failure"] })).toBe(
      "about 3.2 failures (likely 1.1 to 6.4)",
    );
    expect(describeOutlook({ expected: 0.48, lower: null, upper: null, noun: ["failure"] })).toBe(
      "about a 38% chance of a failure",
    );
    expect(describeOutlook({ expected: 0, lower: 0, upper: 0, noun: ["failure"] })).toBe(
      "no failures expected",
    );
    // "an" where the percentage is read with a vowel: 1 − e^−0.08 = 0.0769, 1 − e^−0.12 = 0.113.
    expect(describeOutlook({ expected: 0.08, lower: null, upper: null, noun: ["failure"] })).toBe(
      "about an 8% chance of a failure",
    );
    expect(describeOutlook({ expected: 0.12, lower: null, upper: null, noun: ["issue"] })).toBe(
      "about an 11% chance of an issue",
    );
    // The small end: under 0.1% is said so, never "a under 0.1%" (1 − e^−0.02 = 0.0198).
    expect(describeOutlook({ expected: 0.0004, lower: 0, upper: 0.02, noun: ["failure"] })).toBe(
      "under a 0.1% chance of a failure, likely under 2%",
    );
    expect(
      describeOutlook({ expected: 0.02, lower: 0.00001, upper: 0.05, noun: ["failure"] }),
    ).toBe("about a 2% chance of a failure, likely under 5%");
  });

  test("events against chance read as times what chance predicts, never as a bare ratio", () => {
    expect(describeAgainstChance({ observed: 48, expected: 3.2, lower: 11, upper: 20 })).toBe(
      "about 15 times what chance predicts, at least 11 times",
    );
    expect(describeAgainstChance({ observed: 4, expected: 3, lower: 0.36, upper: 3.4 })).toBe(
      "about 1.3 times what chance predicts; could be chance (likely between 0.36 and 3.4 times)",
    );
    expect(describeAgainstChance({ observed: 3, expected: 3.1, lower: 0.2, upper: null })).toBe(
      "about what chance predicts; could be chance (likely between 0.2 and many times)",
    );
    expect(describeAgainstChance({ observed: 0, expected: 2.1, lower: 0, upper: 1.4 })).toBe(
      "none, against about 2.1 by chance",
    );
    expect(describeAgainstChance({ observed: 0, expected: 0, lower: 0, upper: null })).toBe(
      "nothing measured to set against chance",
    );
  });

  test("a cell's details hold the exact figures in the organisation's unit, p, q and the method", () => {
    const cell = {
      ratePer10kMi: 1.609344,
      rateLower: 0.8,
      rateUpper: 3.2,
      ratio: null,
      ratioLower: 27.84,
      ratioUpper: Infinity,
      pValue: 2.7e-38,
      qValue: 7.6e-7,
    };
    const rows = Object.fromEntries(cellFigureRows(cell, 0.9, "km"));
    // 1.609344 per 10,000 mi = 1 per 10,000 km (NIST SP 811 Appendix B: 1 mi = 1.609344 km).
    expect(rows["Rate per 10,000 km"]).toBe("1 (90% interval: 0.5 to 2)");
    expect(rows["Rate ratio, against the rest of the fleet"]).toBe(
      "not finite: no repairs of this in the rest of the fleet (90% interval: 28 to no upper limit)",
    );
    expect(rows["p (exact test of the ratio)"]).toBe("below 0.0001");
    expect(rows["q (false-discovery rate)"]).toBe("below 0.0001");
    expect(rows.Method).toMatch(/Garwood.*Benjamini–Hochberg/);
    expect(JSON.stringify(rows)).not.toMatch(/e-\d|∞/);
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
