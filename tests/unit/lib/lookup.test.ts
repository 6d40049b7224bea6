import { describe, expect, test } from "vitest";
import {
  absorbCells,
  causeShare,
  compareCauses,
  describeRecordedFix,
  isFixOf,
  LookupQuery,
  walkInOf,
  rankCauses,
  readCodes,
  readSymptom,
  selectMatchedLines,
  type Candidate,
  type LookupLine,
} from "@/lib/lookup";
import { wilsonInterval } from "@/lib/stats";

// Sources, as labelled beside each expected value:
// - "Wilson 1927 via statistics.md": the published Wilson 95% interval for 81/263.
// - "SAE J2012 via trade-facts.md": DTC structure.
// - "Recurra's rule": a choice made in lib/lookup.ts (stated on the page), not a standard.

let nextId = 1;
function line(over: Partial<LookupLine> = {}): LookupLine {
  return {
    id: nextId++,
    vehicleId: 1,
    openedOn: "2024-01-01",
    odometerMi: 60_000,
    componentSlug: null,
    symptom: null,
    codes: [],
    isFromFinding: false,
    ...over,
  };
}

const PURGE = { component: "fuel-vapour/purge-valve", dtcs: ["P0496", "P0441"] };
const CAP = { component: "fuel-vapour/filler-cap", dtcs: [] };

describe("the query", () => {
  test("blank fields are absent, the odometer takes thousands separators", () => {
    const q = LookupQuery.parse({ vin: " ", odometer: "61,250", symptom: "", dtc: "p0496" });
    expect(q).toEqual({ odometer: 61250, dtc: "p0496" });
  });
  test("bad values get a message per field", () => {
    const r = LookupQuery.safeParse({ odometer: "lots", symptom: "sneezing" });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(["odometer", "symptom"]);
    expect(r.error!.issues[0]!.message).toMatch(/Odometer/);
    // A decimal comma is refused, not read as 6125.
    expect(LookupQuery.safeParse({ odometer: "612,5" }).success).toBe(false);
  });
  test("a vehicle not on file: make, model and year, the year from the VIN when blank", () => {
    const q = LookupQuery.parse({ make: " Aurel ", model: "Kestrel", year: "2017" });
    expect(walkInOf(q, undefined)).toEqual({
      make: "Aurel",
      model: "Kestrel",
      year: 2017,
      isYearFromVin: false,
    });
    expect(walkInOf(q, 1989)?.year).toBe(2017); // typed wins over the VIN's
    const noYear = LookupQuery.parse({ make: "Aurel", model: "Kestrel" });
    expect(walkInOf(noYear, 1989)).toMatchObject({ year: 1989, isYearFromVin: true });
    expect(walkInOf(noYear, undefined)).toBeNull();
    expect(walkInOf(LookupQuery.parse({ make: "Aurel", year: "2017" }), undefined)).toBeNull();
    const bad = LookupQuery.safeParse({ year: "1890" });
    expect(bad.error?.issues[0]?.message).toBe("Model year: 1980 or later.");
  });
  test("codes are decoded and invalid ones named (SAE J2012 via trade-facts.md)", () => {
    const { codes, invalid } = readCodes("p0496, P0A80 X1234 P0496 P1234");
    expect(codes.map((c) => [c.code, c.control])).toEqual([
      ["P0496", "generic"],
      ["P0A80", "generic"],
      ["P1234", "manufacturer"],
    ]);
    expect(codes[0]!.subsystem).toBe("auxiliary emission controls");
    expect(invalid).toEqual(["X1234"]);
  });
  test("the chosen symptom wins; else words are read (Recurra's rule)", () => {
    expect(readSymptom("noise", "stalls after fuel")).toEqual({
      symptom: "noise",
      source: "chosen",
    });
    expect(readSymptom(undefined, "stalled right after filling up").symptom).toBe("stall");
    expect(readSymptom(undefined, "misfire").symptom).toBe("rough-running");
    expect(readSymptom(undefined, "zzz")).toEqual({ symptom: null, source: null });
  });
});

describe("which lines are counted (Recurra's rule)", () => {
  const band = { fromMi: 50_000, toMi: 75_000 };
  test("lines with an entered code or the symptom, in the band, not written by findings", () => {
    const lines = [
      ...Array.from({ length: 10 }, () => line({ codes: ["P0496"] })),
      line({ symptom: "stall" }),
      line({ codes: ["P0300"] }), // neither
      line({ codes: ["P0496"], odometerMi: 80_000 }), // other band
      line({ codes: ["P0496"], isFromFinding: true }), // counted as a finding instead
    ];
    const m = selectMatchedLines(lines, { codes: ["P0496"], symptom: "stall", band });
    expect(m.isWidened).toBe(false);
    expect(m.lines).toHaveLength(11);
  });
  test("fewer than 10 in the band: the whole cohort, and it says so", () => {
    const lines = [
      ...Array.from({ length: 9 }, () => line({ codes: ["P0496"] })),
      line({ codes: ["P0496"], odometerMi: 120_000 }),
      line({ codes: ["P0496"], odometerMi: null }),
    ];
    const m = selectMatchedLines(lines, { codes: ["P0496"], symptom: null, band });
    expect(m.isWidened).toBe(true);
    expect(m.lines).toHaveLength(11);
    // Exactly 10 in the band is enough.
    const ten = selectMatchedLines([...lines, line({ codes: ["P0496"] })], {
      codes: ["P0496"],
      symptom: null,
      band,
    });
    expect(ten).toMatchObject({ isWidened: false });
    expect(ten.lines).toHaveLength(10);
  });
  test("no codes and no symptom: every line of the band", () => {
    const lines = Array.from({ length: 12 }, (_, i) => line({ codes: i % 2 ? ["P0300"] : [] }));
    expect(selectMatchedLines(lines, { codes: [], symptom: null, band }).lines).toHaveLength(12);
  });
});

describe("how often it was the cause", () => {
  test("a fix is the fault's component when it names one, else its DTCs", () => {
    expect(isFixOf({ componentSlug: "fuel-vapour/purge-valve", codes: [] }, PURGE)).toBe(true);
    // The filler cap replaced on a P0496 line was not a purge-valve fix.
    expect(isFixOf({ componentSlug: "fuel-vapour/filler-cap", codes: ["P0496"] }, PURGE)).toBe(
      false,
    );
    expect(
      isFixOf({ componentSlug: null, codes: ["P0700"] }, { component: null, dtcs: ["P0700"] }),
    ).toBe(true);
  });
  test("lines plus findings, with the Wilson interval (Wilson 1927 via statistics.md)", () => {
    const matched = [
      ...Array.from({ length: 80 }, () => ({ componentSlug: PURGE.component, codes: [] })),
      ...Array.from({ length: 180 }, () => ({ componentSlug: null, codes: [] })),
    ];
    // 80 fixed of 260 lines, + 1 confirmed + 2 not the cause = 81 of 263.
    const s = causeShare(matched, PURGE, { confirmed: 1, notTheCause: 2 });
    expect(s).toMatchObject({ successes: 81, trials: 263, fromLines: { fixed: 80, of: 260 } });
    expect(s.lower).toBeCloseTo(0.2553, 4); // published: 0.2553–0.3662
    expect(s.upper).toBeCloseTo(0.3662, 4);
  });
  test("nothing to count: no share and no interval", () => {
    expect(causeShare([], PURGE)).toMatchObject({ trials: 0, estimate: null, lower: null });
  });
});

describe("ranking (Recurra's rule: Wilson lower bound first)", () => {
  const cand = (
    title: string,
    x: number,
    n: number,
    kind: Candidate["kind"] = "cell",
  ): Candidate => {
    const i = n > 0 ? wilsonInterval(x, n) : null;
    return {
      key: title,
      kind,
      title,
      fault: { component: title, dtcs: [] },
      data: null,
      share: {
        successes: x,
        trials: n,
        fromLines: { fixed: x, of: n },
        fromFindings: { confirmed: 0, notTheCause: 0 },
        estimate: i?.estimate ?? null,
        lower: i?.lower ?? null,
        upper: i?.upper ?? null,
      },
    };
  };
  test("9 of 12 outranks 1 of 1; nothing counted goes last", () => {
    const order = rankCauses([cand("one", 1, 1), cand("none", 0, 0), cand("nine", 9, 12)]);
    expect(order.map((c) => c.title)).toEqual(["nine", "one", "none"]);
    // Their lower bounds say why: 0.4677 > 0.2065 (computed with wilsonInterval).
    expect(wilsonInterval(9, 12).lower).toBeGreaterThan(wilsonInterval(1, 1).lower);
  });
  test("ties on the lower bound: the higher share, then the larger count", () => {
    // 0 of 5 and 0 of 9 both have lower bound 0 and share 0: the larger count first.
    expect(rankCauses([cand("b", 0, 5), cand("a", 0, 9)]).map((c) => c.title)).toEqual(["a", "b"]);
    // 1 of 1 has lower bound 0.2065 (computed with wilsonInterval); a made-up candidate with the
    // same lower bound but a lower share comes after it.
    const one = cand("one", 1, 1);
    const other = { ...cand("other", 1, 2), share: { ...one.share, estimate: 0.5 } };
    expect(rankCauses([other, one]).map((c) => c.title)).toEqual(["one", "other"]);
  });
  test("equal evidence: the known issue first", () => {
    const a = cand("z-issue", 3, 6, "known-issue");
    const b = cand("a-cell", 3, 6, "cell");
    expect(compareCauses(a, b)).toBeLessThan(0);
  });
});

describe("a known issue absorbs the cell of its fault", () => {
  test("same component or one of its DTCs: dropped; others kept", () => {
    const cells = [
      { name: "purge", fault: { component: PURGE.component, dtcs: [] } },
      { name: "code", fault: { component: null, dtcs: ["P0441"] } },
      { name: "cap", fault: CAP },
    ];
    expect(absorbCells([{ fault: PURGE }], cells).map((c) => c.name)).toEqual(["cap"]);
  });
});

describe("the recorded fix", () => {
  test("the recorded fix of a bare cell: median hours, common parts and correction", () => {
    const f = describeRecordedFix([
      line({ laborHours: 0.7, partNumbers: "PV-1", correction: "Replaced valve" }),
      line({ laborHours: 1.2, partNumbers: "PV-1 CL-2", correction: "Replaced valve" }),
      line({ laborHours: 0.9, partNumbers: null, correction: "Other" }),
      line({ laborHours: 1.0, partNumbers: "PV-2" }),
    ]);
    expect(f).toEqual({
      typicalHours: 0.95,
      parts: ["PV-1", "CL-2", "PV-2"],
      correction: "Replaced valve",
    });
  });
});
