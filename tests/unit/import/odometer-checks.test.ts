import { describe, expect, test } from "vitest";
import {
  fingerprint52,
  FingerprintMap,
  fingerprintValues,
  FingerprintSet,
} from "@/jobs/import/fingerprint-set";
import { dayNumber, MAX_READINGS, OdometerChecks } from "@/jobs/import/odometer-checks";
import { cleanOdometerReadings } from "@/lib/stats/clean-odometer-readings";

describe("dayNumber", () => {
  test("agrees with Date.UTC (ECMA-262 MakeDay) on every day from 1899 to 2100", () => {
    let mismatches = 0;
    for (let t = Date.UTC(1899, 0, 1); t <= Date.UTC(2100, 11, 31); t += 86_400_000) {
      if (dayNumber(new Date(t).toISOString().slice(0, 10)) !== t / 86_400_000) mismatches++;
    }
    expect(mismatches).toBe(0);
    // Leap days of the Gregorian rule: 2000 is a leap year, 1900 and 2100 are not.
    expect(dayNumber("2000-03-01") - dayNumber("2000-02-28")).toBe(2);
    expect(dayNumber("1900-03-01") - dayNumber("1900-02-28")).toBe(1);
    expect(dayNumber("2024-06-30T10:15:00Z")).toBe(Date.UTC(2024, 5, 30) / 86_400_000);
  });
});

// Thresholds (20% or 10,000 mi below an earlier reading, 1,500 mi a day) are Recurra's rule
// (jobs/import/odometer-checks.ts); "about 1.609" is NIST SP 811's 1 mi = 1.609344 km.
describe("OdometerChecks", () => {
  test("a reading of 1,200 mi on a vehicle at about 170,000 mi is a warning", () => {
    const checks = new OdometerChecks();
    checks.seed("V1", "2025-05-01", 170_250);
    expect(checks.check("V1", "2025-06-01", 1_200)).toBe(
      "odometer goes backwards: 1,200 mi on 2025-06-01, below 170,250 mi on 2025-05-01",
    );
    // Not remembered: the next correct reading is judged against 170,250, and passes.
    expect(checks.check("V1", "2025-06-10", 171_000)).toBeNull();
  });

  test("a normal progression gets none, in any row order, with repeats and small dips", () => {
    const checks = new OdometerChecks();
    checks.seed("V1", "2025-01-01", 40_000);
    const readings: [string, number][] = [
      ["2025-02-01", 41_200],
      ["2025-02-01", 41_200], // another line of the same repair order
      ["2025-03-03", 42_350],
      ["2025-02-15", 41_700], // a row out of date order
      ["2025-04-01", 42_100], // 250 mi below an earlier reading: within 10,000 mi
      ["2025-04-02", 43_600], // exactly 1,500 mi in a day
    ];
    for (const [on, mi] of readings) expect(checks.check("V1", on, mi), on).toBeNull();
  });

  test("more than 1,500 mi a day from the reading before or after is a warning", () => {
    const checks = new OdometerChecks();
    checks.seed("V1", "2025-01-01", 40_000);
    expect(checks.check("V1", "2025-01-02", 41_501)).toBe(
      "odometer implies 1,501 mi a day since 40,000 mi on 2025-01-01",
    );
    expect(checks.check("V1", "2025-01-11", 43_000)).toBeNull();
    // Dated between two readings, 3,000 mi short of the one a day later.
    expect(checks.check("V1", "2025-01-10", 40_000)).toBe(
      "odometer implies 3,000 mi a day until 43,000 mi on 2025-01-11",
    );
  });

  test("below an earlier reading: more than 20% or 10,000 mi, whichever is larger", () => {
    const checks = new OdometerChecks();
    checks.seed("LOW", "2024-01-01", 30_000);
    expect(checks.check("LOW", "2025-01-01", 20_000)).toBeNull(); // 10,000 below: not more
    expect(checks.check("LOW", "2025-01-02", 19_900)).toMatch(/goes backwards/);
    checks.seed("HIGH", "2024-01-01", 170_000);
    expect(checks.check("HIGH", "2025-01-01", 136_000)).toBeNull(); // 20% below: not more
    expect(checks.check("HIGH", "2025-01-02", 135_900)).toMatch(/below 170,000 mi on 2024-01-01/);
  });

  test("a typed-twice digit and kilometres keyed as miles are warnings", () => {
    const checks = new OdometerChecks();
    checks.seed("V1", "2025-01-01", 40_000);
    expect(checks.check("V1", "2027-01-01", 410_000)).toMatch(/order of magnitude/);
    // 41,000 mi × 1.609344 ≈ 65,983: the same distance keyed in kilometres.
    expect(checks.check("V1", "2025-02-01", 41_000)).toBeNull();
    expect(checks.check("V1", "2025-03-01", 65_983)).toMatch(/1\.609/);
  });

  test("memory stays bounded: past MAX_READINGS a vehicle's oldest readings are folded", () => {
    const checks = new OdometerChecks();
    const day = (n: number) => new Date(Date.UTC(2000, 0, 1 + n)).toISOString().slice(0, 10);
    for (let n = 0; n < MAX_READINGS * 2; n++) {
      expect(checks.check("V1", day(n), 10_000 + n * 20)).toBeNull();
    }
    // Judged against the folded readings' highest still; older than them: not judged.
    expect(checks.check("V1", day(MAX_READINGS * 2 + 1), 100)).toMatch(/goes backwards/);
    expect(checks.check("V1", day(10), 1)).toBeNull();
  });

  test("a warned backwards reading is left out of exposure by the cleaning rule", () => {
    // lib/stats/clean-odometer-readings.ts drops backwards readings; this shows that a reading
    // the import warns about is among those it drops.
    const file: [string, number][] = [
      ["2025-03-01", 168_000],
      ["2025-04-01", 169_400],
      ["2025-05-01", 1_200],
      ["2025-06-01", 171_900],
    ];
    const checks = new OdometerChecks();
    checks.seed("V1", "2025-02-01", 166_500);
    const warned = file.filter(([on, mi]) => checks.check("V1", on, mi) !== null);
    expect(warned).toEqual([["2025-05-01", 1_200]]);
    const { kept, ignored } = cleanOdometerReadings(
      [["2025-02-01", 166_500] as [string, number], ...file].map(([at, odometer]) => ({
        at,
        odometer,
      })),
    );
    expect(ignored).toBe(1);
    expect(kept.map((k) => k.odometer)).toEqual([166_500, 168_000, 169_400, 171_900]);
  });
});

describe("row fingerprints", () => {
  test("fingerprintValues equals fingerprint52 of the values joined with \\u0001", () => {
    const rows = [
      ["RO-1", 42000, null, "Stalls after filling up", true, undefined, ""],
      ["RO-1", 42000, null, "Stalls after filling up", false, undefined, ""],
      ["ÄÖ – “quoted”", 1.5, -3, "x'y", null],
    ];
    for (const row of rows) {
      expect(fingerprintValues(row)).toBe(
        fingerprint52(row.map((v) => `${v ?? ""}\u0001`).join("")),
      );
    }
    const set = new FingerprintSet();
    expect(set.add(fingerprintValues(rows[0]!))).toBe(true);
    expect(set.add(fingerprintValues(rows[1]!))).toBe(true);
    expect(set.add(fingerprintValues([...rows[0]!]))).toBe(false);
  });
});

describe("FingerprintMap", () => {
  test("maps 200,000 RO numbers to their order, through growth, exactly as a Map does", () => {
    const map = new FingerprintMap();
    const reference = new Map<string, number>();
    for (let i = 0; i < 200_000; i++) {
      const ro = i % 3 === 0 ? `RO-${i}` : `${i}-B`;
      map.set(ro, i);
      reference.set(ro, i);
    }
    map.set("RO-3", -7);
    reference.set("RO-3", -7);
    expect(map.size).toBe(reference.size);
    let differences = 0;
    for (const [key, value] of reference) if (map.get(key) !== value) differences++;
    expect(differences).toBe(0);
    expect(map.get("RO-1")).toBeUndefined();
    expect(map.get("")).toBeUndefined();
  });

  test("getOrSet gives the first value of a key and sets new keys, as a Map would", () => {
    const map = new FingerprintMap();
    const reference = new Map<string, number>();
    let differences = 0;
    for (let i = 0; i < 100_000; i++) {
      // Every key comes back a few times, far apart: through the table's growth.
      const ro = `RO-${(i * 7919) % 40_000}`;
      const expected = reference.get(ro);
      if (expected === undefined) reference.set(ro, i);
      if (map.getOrSet(ro, i) !== expected) differences++;
    }
    expect(differences).toBe(0);
    expect(map.size).toBe(reference.size);
    expect(map.get("RO-0")).toBe(0);
  });
});
