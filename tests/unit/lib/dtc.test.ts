import { describe, expect, test } from "vitest";

import {
  DTC_AREAS,
  decodeDtcBytes,
  decodeDtcThreeBytes,
  encodeDtcBytes,
  isValidDtc,
  normaliseDtc,
  parseDtc,
  splitDtcList,
} from "@/lib/dtc";

// Sources, as labelled beside each expected value:
// - "SAE J2012 via trade-facts.md": structure, areas, control and P0 subsystems.
// - "SAE J1979 worked pair, trade-facts.md": the two-byte service $03 examples.
// - "ISO 14229-1 example, trade-facts.md": the three-byte example.
// - "Recurra's rule": a choice made in lib/dtc.ts, not a standard.

describe("structure", () => {
  test("a letter, a digit 0–3, then three hex characters", () => {
    // SAE J2012 via trade-facts.md.
    for (const ok of ["P0A80", "P0300", "B1234", "C0123", "U0073", "P3FFF", "U3000", "P0FFF"]) {
      expect(isValidDtc(ok), ok).toBe(true);
    }
    expect(isValidDtc("P4000")).toBe(false); // second character only 0–3
    expect(isValidDtc("P0G00")).toBe(false); // G is not hexadecimal
    expect(isValidDtc("P00G0")).toBe(false);
    expect(isValidDtc("X0300")).toBe(false); // letters P C B U only
    expect(isValidDtc("P030")).toBe(false); // five characters
    expect(isValidDtc("P03000")).toBe(false);
    expect(isValidDtc("")).toBe(false);
    expect(isValidDtc("P 0300")).toBe(false);
  });

  test("lower case and surrounding space are accepted and normalised", () => {
    // SAE J2012 via trade-facts.md (codes are upper case); Recurra's rule to accept typing.
    expect(normaliseDtc("  p0a80 ")).toBe("P0A80");
    expect(parseDtc("p0a80")?.code).toBe("P0A80");
    expect(isValidDtc("u0131")).toBe(true);
  });

  test("area names", () => {
    // SAE J2012 via trade-facts.md: P powertrain, C chassis, B body, U network.
    expect(DTC_AREAS).toEqual({ P: "powertrain", C: "chassis", B: "body", U: "network" });
    expect(parseDtc("P0300")?.areaName).toBe("powertrain");
    expect(parseDtc("C0123")?.areaName).toBe("chassis");
    expect(parseDtc("B1234")?.areaName).toBe("body");
    expect(parseDtc("U0131")?.areaName).toBe("network");
    expect(parseDtc("U0131")?.area).toBe("U");
  });
});

describe("who controls the code", () => {
  // SAE J2012 via trade-facts.md.
  const cases: [string, "generic" | "manufacturer" | "reserved"][] = [
    ["P0300", "generic"],
    ["P0A80", "generic"],
    ["P2000", "generic"],
    ["P2FFF", "generic"],
    ["P1000", "manufacturer"],
    ["P1FFF", "manufacturer"],
    ["P3000", "manufacturer"],
    ["P33FF", "manufacturer"],
    ["P3400", "generic"],
    ["P39FF", "generic"],
    ["P3A00", "generic"],
    ["P3FFF", "generic"],
    ["B0001", "generic"],
    ["C0031", "generic"],
    ["U0073", "generic"],
    ["B1234", "manufacturer"],
    ["B2000", "manufacturer"],
    ["C1000", "manufacturer"],
    ["C2FFF", "manufacturer"],
    ["U1000", "manufacturer"],
    ["U2100", "manufacturer"],
    ["B3000", "reserved"],
    ["C3000", "reserved"],
    ["U3FFF", "reserved"],
  ];
  test.each(cases)("%s is %s", (code, control) => {
    expect(parseDtc(code)?.control).toBe(control);
  });
});

describe("P0 subsystem by third character", () => {
  // SAE J2012 via trade-facts.md (wording Recurra's own).
  const cases: [string, string][] = [
    ["P0087", "fuel and air metering, auxiliary emission controls"],
    ["P0171", "fuel and air metering"],
    ["P0201", "fuel and air metering (injector circuit)"],
    ["P0300", "ignition system or misfire"],
    ["P0335", "ignition system or misfire"],
    ["P0441", "auxiliary emission controls"],
    ["P0455", "auxiliary emission controls"],
    ["P0506", "vehicle speed, idle control and auxiliary inputs"],
    ["P0562", "vehicle speed, idle control and auxiliary inputs"],
    ["P0620", "computer and output circuits"],
    ["P0700", "transmission"],
    ["P0730", "transmission"],
    ["P0850", "transmission"],
    ["P0900", "transmission"],
    ["P0A80", "hybrid propulsion"],
    ["P0B00", "hybrid propulsion"],
    ["P0C00", "hybrid propulsion"],
  ];
  test.each(cases)("%s → %s", (code, subsystem) => {
    expect(parseDtc(code)?.subsystem).toBe(subsystem);
  });

  test("no subsystem outside P0, nor for P0D–P0F (trade-facts.md lists none)", () => {
    // SAE J2012 via trade-facts.md gives the table for P0 codes only.
    expect(parseDtc("P1300")?.subsystem).toBeUndefined();
    expect(parseDtc("P2300")?.subsystem).toBeUndefined();
    expect(parseDtc("U0300")?.subsystem).toBeUndefined();
    expect(parseDtc("P0D00")?.subsystem).toBeUndefined();
  });
});

describe("two-byte form, SAE J1979 service $03", () => {
  // SAE J1979 worked pairs, trade-facts.md.
  const pairs: [number, number, string][] = [
    [0x01, 0x35, "P0135"],
    [0x92, 0x34, "B1234"],
    [0x41, 0x23, "C0123"],
    [0xc0, 0x73, "U0073"],
    [0x0a, 0x80, "P0A80"],
    [0x03, 0x00, "P0300"],
  ];

  test.each(pairs)("%i %i decodes to %s and encodes back", (high, low, code) => {
    expect(decodeDtcBytes(high, low)).toBe(code);
    expect(encodeDtcBytes(code)).toEqual([high, low]);
    expect(encodeDtcBytes(code.toLowerCase())).toEqual([high, low]);
  });

  test("00 00 is padding", () => {
    // SAE J1979 worked pair, trade-facts.md.
    expect(decodeDtcBytes(0x00, 0x00)).toBeNull();
    // Neither byte alone is padding: 00 01 is P0001, 01 00 is P0100 (bit layout, trade-facts.md).
    expect(decodeDtcBytes(0x00, 0x01)).toBe("P0001");
    expect(decodeDtcBytes(0x01, 0x00)).toBe("P0100");
  });

  test("every non-padding pair decodes to a valid code that encodes back to the same bytes", () => {
    // Bit layout from trade-facts.md: 2 bits letter, 2 bits digit, 12 bits three hex digits,
    // so the 65,535 non-zero pairs and the codes other than P0000 correspond one to one.
    const seen = new Set<string>();
    for (let high = 0; high <= 0xff; high++) {
      for (let low = 0; low <= 0xff; low++) {
        if (high === 0 && low === 0) continue;
        const code = decodeDtcBytes(high, low);
        if (code === null || !isValidDtc(code)) throw new Error(`${high} ${low} → ${code}`);
        const [h, l] = encodeDtcBytes(code);
        if (h !== high || l !== low) throw new Error(`${code} → ${h} ${l}, want ${high} ${low}`);
        seen.add(code);
      }
    }
    expect(seen.size).toBe(65535);
  });

  test("bytes outside 0–255 or not integers are refused", () => {
    // SAE J1979 via trade-facts.md: each is one byte.
    for (const [h, l] of [
      [256, 0],
      [0, 256],
      [-1, 0],
      [0, -1],
      [1.5, 0],
      [0, Number.NaN],
    ] as [number, number][]) {
      expect(() => decodeDtcBytes(h, l), `${h} ${l}`).toThrow(/decodeDtcBytes/);
    }
  });

  test("encoding refuses what is not a five-character DTC", () => {
    // SAE J2012 via trade-facts.md; the two-byte form has no room for a failure-type byte.
    expect(() => encodeDtcBytes("P4000")).toThrow(/encodeDtcBytes/);
    expect(() => encodeDtcBytes("P0G00")).toThrow(/encodeDtcBytes/);
    expect(() => encodeDtcBytes("")).toThrow(/encodeDtcBytes/);
    expect(() => encodeDtcBytes("C0031-23")).toThrow(/encodeDtcBytes/);
  });
});

describe("three-byte form, ISO 14229-1", () => {
  test("0x403123 → C0031-23", () => {
    // ISO 14229-1 example, trade-facts.md.
    expect(decodeDtcThreeBytes(0x403123)).toBe("C0031-23");
    const info = parseDtc("C0031-23");
    expect(info).toEqual({
      code: "C0031",
      area: "C",
      areaName: "chassis",
      control: "generic",
      failureType: "23",
    });
    expect(parseDtc("c0031-23")?.failureType).toBe("23");
  });

  test("the failure-type byte is two upper-case hex digits, zero-padded", () => {
    // ISO 14229-1 via trade-facts.md (third byte written as a suffix); bytes as in the
    // SAE J1979 worked pairs.
    expect(decodeDtcThreeBytes(0x013500)).toBe("P0135-00");
    expect(decodeDtcThreeBytes(0x92340f)).toBe("B1234-0F");
    expect(decodeDtcThreeBytes(0xc073ff)).toBe("U0073-FF");
  });

  test("a malformed suffix is not a DTC", () => {
    // Recurra's rule: the suffix is exactly two hex digits after a dash.
    expect(isValidDtc("C0031-2")).toBe(false);
    expect(isValidDtc("C0031-2G")).toBe(false);
    expect(isValidDtc("C003123")).toBe(false);
  });

  test("values outside 24 bits or not integers are refused", () => {
    // ISO 14229-1 via trade-facts.md: three bytes.
    for (const bad of [-1, 0x1000000, 1.5, Number.NaN]) {
      expect(() => decodeDtcThreeBytes(bad), String(bad)).toThrow(/decodeDtcThreeBytes/);
    }
  });
});

describe("splitDtcList", () => {
  test("splits on semicolons, commas and any white space, normalising case", () => {
    // Codes from trade-facts.md's generic list; separators are Recurra's rule.
    expect(splitDtcList("P0441; P0496 p0455,P0457\nU0131\t,;P0300")).toEqual({
      valid: ["P0441", "P0496", "P0455", "P0457", "U0131", "P0300"],
      invalid: [],
    });
  });

  test("duplicates are kept once, in first-seen order", () => {
    // Recurra's rule.
    expect(splitDtcList("P0441 p0441; P0300,P0441")).toEqual({
      valid: ["P0441", "P0300"],
      invalid: [],
    });
  });

  test("invalid tokens are returned as typed, valid ones still kept", () => {
    // SAE J2012 via trade-facts.md decides validity: P4000 (digit 4), P0G00 (G not hex).
    expect(splitDtcList("P4000; p0171, P0G00 misfire P0300")).toEqual({
      valid: ["P0171", "P0300"],
      invalid: ["P4000", "P0G00", "misfire"],
    });
  });

  test("empty, null and undefined give empty lists", () => {
    // Recurra's rule.
    const empty = { valid: [], invalid: [] };
    expect(splitDtcList("")).toEqual(empty);
    expect(splitDtcList(" ; , ")).toEqual(empty);
    expect(splitDtcList(null)).toEqual(empty);
    expect(splitDtcList(undefined)).toEqual(empty);
  });

  test("a failure-type suffix is dropped in the list (base codes only)", () => {
    // Recurra's rule in lib/dtc.ts: the list holds five-character codes; see the report.
    expect(splitDtcList("C0031-23 C0031")).toEqual({ valid: ["C0031"], invalid: [] });
  });
});
