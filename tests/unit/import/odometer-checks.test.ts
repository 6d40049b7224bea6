import { describe, expect, test } from "vitest";
import {
  fingerprint52,
  FingerprintMap,
  fingerprintValues,
  FingerprintSet,
} from "@/jobs/import/fingerprint-set";
import { dayNumber, OdometerChecks } from "@/jobs/import/odometer-checks";

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

describe("OdometerChecks", () => {
  test("warns about backwards readings, jumps, km keyed as miles and absurd daily distances", () => {
    const checks = new OdometerChecks();
    checks.seed("V1", "2025-01-01", 40_000);
    expect(checks.check("V1", "2025-02-01", 41_000)).toBeNull();
    expect(checks.check("V1", "2025-02-10", 30_000)).toMatch(/goes backwards/);
    expect(checks.check("V1", "2025-03-01", 410_000)).toMatch(/order of magnitude/);
    // 41,000 mi × 1.609344 ≈ 65,983: the same distance keyed in kilometres.
    expect(checks.check("V1", "2025-03-02", 65_983)).toMatch(/1\.609/);
    expect(checks.check("V1", "2025-02-03", 60_000)).toMatch(/mi a day/);
    // An older reading than the latest one is not judged.
    expect(checks.check("V1", "2024-12-01", 10)).toBeNull();
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
