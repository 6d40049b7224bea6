import { describe, expect, test } from "vitest";
import { cellOfRanked, toRankedCell, type CellFigures } from "@/lib/cell-types";
import {
  cellDetails,
  CHOOSABLE_METRICS,
  describeCell,
  metricFigure,
  metricFor,
  metricHeader,
  RATE,
  RATIO,
  SHARE,
  SHRUNK,
  WEAR_RATE,
} from "@/lib/metrics";

// Sources: the wording and units are Recurra's own rule (issue on trustworthy numbers);
// 1 mi = 1.609344 km exactly (NIST SP 811 Appendix B).

function cell(over: Partial<CellFigures> = {}): CellFigures {
  return {
    kind: "failure",
    events: 12,
    exposureMi: 340_000,
    vehiclesAtRisk: 40,
    vehiclesAffected: 9,
    ratePer10k: 0.353,
    rateLower: 0.182,
    rateUpper: 0.616,
    shareAffected: 0.225,
    shareLower: 0.123,
    shareUpper: 0.375,
    rateRatio: 6.02,
    ratioLower: 5.2,
    ratioUpper: 7.1,
    pValue: 2.7e-38,
    qValue: 7.6e-7,
    shrunkRatePer10k: 0.3,
    shrunkLower: 0.2,
    shrunkUpper: 0.45,
    isSignal: true,
    hasTooLittleData: false,
    ...over,
  };
}

const mi = { unit: "mi" as const, confidence: 0.9 };
const km = { unit: "km" as const, confidence: 0.95 };

describe("each metric, defined once", () => {
  test("labels and headers follow the organisation's unit and confidence", () => {
    expect(metricHeader(RATE, mi)).toBe("Repairs per 10,000 mi (90% interval)");
    expect(metricHeader(RATE, km)).toBe("Repairs per 10,000 km (95% interval)");
    expect(metricHeader(RATIO, { unit: "mi", confidence: 0.8 })).toBe(
      "Times the rest of the fleet (80% interval)",
    );
    expect(SHARE.label("mi")).toBe("Share of vehicles affected");
    expect(SHRUNK.label("km")).toBe("Steady rate per 10,000 km");
    expect(WEAR_RATE.label("mi")).toBe("Wear repairs per 10,000 mi");
  });

  test("each names its method with its source", () => {
    expect(RATE.method).toBe("Exact Poisson interval (Garwood 1936)");
    expect(RATIO.method).toMatch(/^Exact conditional test against the rest of the fleet/);
    expect(SHARE.method).toBe("Wilson score interval (Wilson 1927)");
    expect(SHRUNK.method).toBe("Empirical Bayes, gamma–Poisson");
  });

  test("values and intervals come in the organisation's unit", () => {
    const c = cell();
    expect(RATE.value(c, "mi")).toBe(0.353);
    // Per 10,000 km is per 6,213.7 mi: the rate per 10,000 mi divided by 1.609344.
    expect(RATE.value(c, "km")).toBeCloseTo(0.353 / 1.609344, 12);
    expect(RATE.interval(c, "km").upper).toBeCloseTo(0.616 / 1.609344, 12);
    expect(SHRUNK.interval(c, "km").lower).toBeCloseTo(0.2 / 1.609344, 12);
    expect(RATIO.value(c, "km")).toBe(6.02);
    expect(metricFigure(RATE, c, "mi")).toEqual({ value: "0.35", likely: "likely 0.18 to 0.62" });
    expect(metricFigure(SHARE, c, "mi")).toEqual({ value: "23%", likely: "likely 12% to 38%" });
  });

  test("a wear cell's rate is the wear rate, for every choice of the rate", () => {
    expect(metricFor("rate", "wear")).toBe(WEAR_RATE);
    expect(metricFor("rate", "failure")).toBe(RATE);
    expect(metricFor("ratio", "wear")).toBe(RATIO);
    expect(CHOOSABLE_METRICS).toEqual(["rate", "ratio", "share", "shrunk"]);
  });
});

describe("no ∞, no exponent forms", () => {
  test("a fault the rest of the fleet never had reads as at least its lower limit", () => {
    const c = cell({ rateRatio: null, ratioLower: 27.84, ratioUpper: null });
    expect(RATIO.value(c, "mi")).toBe(Number.POSITIVE_INFINITY);
    expect(metricFigure(RATIO, c, "mi")).toEqual({
      value: "≥ 28",
      likely: "likely 28 to no upper limit",
    });
    expect(RATIO.describe(c, mi)).toBe(
      "no repairs of this in the rest of the fleet in this band, at least 28 times its rate",
    );
  });

  test("the details carry p and q in plain decimals", () => {
    const details = Object.fromEntries(cellDetails(cell(), mi));
    expect(details["p (exact test against the rest of the fleet)"]).toBe("below 0.0001");
    expect(details["q (false discovery rate across the failure cells)"]).toBe("below 0.0001");
    expect(details["Repairs per 10,000 mi"]).toBe(
      "0.35; 90% interval 0.18 to 0.62. Exact Poisson interval (Garwood 1936).",
    );
    for (const v of Object.values(details)) expect(v).not.toMatch(/∞|e-\d/);
  });
});

describe("figures in words", () => {
  test("a failure cell: count in distance, rate, likely range; then times the rest", () => {
    expect(describeCell(cell(), mi)).toBe(
      "12 repairs in 340,000 mi driven: about 0.35 per 10,000 mi, likely between 0.18 and 0.62; about 6 times the rest of the fleet, at least 5.2 times.",
    );
    expect(SHARE.describe(cell(), mi)).toBe(
      "affected: 9 of 40 vehicles (23%), likely between 12% and 38%",
    );
  });

  test("a wear cell wears out sooner than on the rest of the fleet", () => {
    const wear = cell({ kind: "wear", rateRatio: 2.1, ratioLower: 1.4, ratioUpper: 3.2 });
    expect(describeCell(wear, mi)).toBe(
      "12 wear repairs in 340,000 mi driven: about 0.35 per 10,000 mi, likely between 0.18 and 0.62; wears out sooner than on the rest of the fleet: about 2.1 times as often, at least 1.4 times.",
    );
    expect(Object.keys(Object.fromEntries(cellDetails(wear, mi)))).toContain(
      "q (false discovery rate across the wear cells)",
    );
  });

  test("a thin cell says so, never a zero", () => {
    expect(describeCell(cell({ hasTooLittleData: true, events: 1, exposureMi: 900 }), mi)).toBe(
      "Too little data to judge: 1 repair in 900 mi driven. Not tested.",
    );
  });
});

describe("a ranked cell keeps its JSON names (other tools read them)", () => {
  test("to the JSON names and back, with nothing lost", () => {
    const stored = {
      ...cell(),
      make: "Aurel",
      model: "Merlin",
      cohortLabel: "M2",
      bandFromMi: 150_000,
      bandToMi: 175_000,
      dtc: "P0730",
    };
    const ranked = toRankedCell(stored, {
      yearFrom: 2014,
      yearTo: 2019,
      component: null,
      faultName: "P0730 — Wrong gear ratio",
    });
    for (const name of [
      "make",
      "model",
      "generation",
      "yearFrom",
      "yearTo",
      "bandFrom",
      "bandTo",
      "dtc",
      "component",
      "kind",
      "events",
      "exposureMiles",
      "vehicles",
      "vehiclesAffected",
      "rate",
      "rateLower",
      "rateUpper",
      "ratio",
      "ratioLower",
      "ratioUpper",
      "pValue",
      "qValue",
      "shrunkRate",
      "signal",
    ])
      expect(ranked).toHaveProperty(name);
    expect(ranked).toMatchObject({
      generation: "M2",
      exposureMiles: 340_000,
      vehicles: 40,
      rate: 0.353,
      ratio: 6.02,
      signal: true,
    });
    expect(cellOfRanked(ranked)).toMatchObject(cell());
  });
});
