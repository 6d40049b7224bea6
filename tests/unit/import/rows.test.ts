import { describe, expect, test } from "vitest";
import { z } from "zod";

import { IMPORT_KINDS, type ImportKind } from "@/db/schema/operations";
import { IMPORT_COLUMNS } from "@/lib/import/columns";
import { autoMapHeaders } from "@/lib/import/mapping";
import type { ReadOptions } from "@/lib/import/read-options";
import { buildRowSchemas, dayAfter } from "@/lib/import/row-schemas";
import {
  columnKeyOfField,
  createRowReader,
  isBlankRecord,
  type RowResult,
} from "@/lib/import/rows";

// Sources, as labelled beside each expected value:
// - "SAE J2012": DTC structure (letter P/C/B/U, digit 0–3, three hex digits), via trade-facts.md.
// - "49 CFR 565": VIN rules (17 characters, no I/O/Q, check digit), with the worked example
//   VINs of trade-facts.md; a wrong check digit is only a warning outside North America.
// - "NIST SP 811": 1 mi = 1.609344 km, 1 US gal = 3.785411784 L exactly.
// - "Recurra's import brief": ranges (model year 1980–2040, odometer 0–2,000,000 mi, labour
//   0–200 h, costs ≥ 0, volume 0–2,000 L, dates 1980-01-01 to today + 1 day).
// - "Recurra's rule": a choice made in lib/import/rows.ts.

const TODAY = "2025-06-30";
const OPTIONS: ReadOptions = {
  dateFormat: "dmy",
  decimalSeparator: ".",
  distanceUnit: "mi",
  volumeUnit: "us-gal",
};

function readerFor<K extends ImportKind>(kind: K, headers: string[], options = OPTIONS) {
  const { mapping } = autoMapHeaders(kind, headers);
  return createRowReader(kind, headers, mapping, options, { today: TODAY });
}

function rowOf<T>(result: RowResult<T>): T {
  if (!result.ok) throw new Error(`expected a row, got ${JSON.stringify(result.issues)}`);
  return result.row;
}

function issuesOf<T>(result: RowResult<T>) {
  if (result.ok) throw new Error("expected a rejection");
  return result.issues;
}

const messages = (issues: readonly { message: string }[]) => issues.map((i) => i.message);

const REPAIR_HEADERS = [
  "RO #",
  "Unit",
  "VIN",
  "Date In",
  "Date Out",
  "Odometer",
  "Complaint",
  "Codes",
  "Component",
  "Symptom",
  "Labor Hrs",
  "Parts Cost",
  "Labor Cost",
  "Warranty",
];

const GOOD_REPAIR: Record<string, string> = {
  "RO #": "RO-1001",
  Unit: "U-17",
  VIN: "1G4AH59H45G118341", // 49 CFR 565.15 sample VIN
  "Date In": "05/03/2024",
  "Date Out": "06/03/2024",
  Odometer: "48,210",
  Complaint: "Stalls a few miles after refuelling, engine light on",
  Codes: "P0441; P0496",
  Component: "Fuel vapour → Purge valve",
  Symptom: "",
  "Labor Hrs": "1.5",
  "Parts Cost": "$84.20",
  "Labor Cost": "180",
  Warranty: "Y",
};

function repairRecord(changes: Record<string, string> = {}): string[] {
  const values = { ...GOOD_REPAIR, ...changes };
  return REPAIR_HEADERS.map((h) => values[h] ?? "");
}

const readRepair = readerFor("repairs", REPAIR_HEADERS);

describe("repairs", () => {
  test("a good row becomes a typed repair line", () => {
    // NIST SP 811 not needed (miles); SAE J2012 for the codes; Recurra's rule for the rest
    const result = readRepair(repairRecord(), 2);
    expect(result.ok && result.warnings).toEqual([]);
    expect(result.rowNumber).toBe(2);
    expect(rowOf(result)).toEqual({
      roNumber: "RO-1001",
      unitNumber: "U-17",
      vin: "1G4AH59H45G118341",
      openedOn: "2024-03-05",
      closedOn: "2024-03-06",
      odometerMi: 48210,
      complaint: "Stalls a few miles after refuelling, engine light on",
      cause: null,
      correction: null,
      dtcCodes: ["P0441", "P0496"],
      componentText: "Fuel vapour → Purge valve",
      symptom: "stall",
      laborHours: 1.5,
      partsCostCents: 8420,
      laborCostCents: 18000,
      partNumbers: null,
      technician: null,
      vendor: null,
      isWarranty: true,
      make: null,
      model: null,
      modelYear: null,
    });
  });

  test("an impossible date rejects the row, naming the column, the value and the format", () => {
    // Gregorian calendar; message wording is Recurra's rule
    const issues = issuesOf(readRepair(repairRecord({ "Date In": "31/02/2024" }), 3));
    expect(issues[0]).toEqual({
      column: "opened_on",
      message: "opened_on: 31/02/2024 is not a date (day/month/year)",
    });
    expect(
      rowOf(readRepair(repairRecord({ "Date In": "29/02/2024", "Date Out": "" }), 3)).openedOn,
    ).toBe("2024-02-29");
    expect(issuesOf(readRepair(repairRecord({ "Date In": "29/02/2023" }), 3))[0]?.column).toBe(
      "opened_on",
    );
  });

  test("dates must fall between 1980-01-01 and the day after today", () => {
    // Recurra's import brief
    expect(dayAfter(TODAY)).toBe("2025-07-01");
    const tomorrow = readRepair(repairRecord({ "Date In": "01/07/2025", "Date Out": "" }), 2);
    expect(rowOf(tomorrow).openedOn).toBe("2025-07-01");
    const later = issuesOf(
      readRepair(repairRecord({ "Date In": "02/07/2025", "Date Out": "" }), 2),
    );
    expect(messages(later)).toEqual(["opened_on: 02/07/2025 is outside 1980-01-01 to 2025-07-01"]);
    const early = issuesOf(
      readRepair(repairRecord({ "Date In": "31/12/1979", "Date Out": "" }), 2),
    );
    expect(early[0]?.column).toBe("opened_on");
  });

  test("closed before opened is rejected", () => {
    // Recurra's rule
    const issues = issuesOf(readRepair(repairRecord({ "Date Out": "01/03/2024" }), 2));
    expect(messages(issues)).toEqual(["closed_on: 01/03/2024 is before opened_on (2024-03-05)"]);
  });

  test("money in cents; a negative cost is read, then rejected by the schema", () => {
    // Recurra's import brief: costs ≥ 0
    expect(rowOf(readRepair(repairRecord({ "Parts Cost": "$1,234.56" }), 2)).partsCostCents).toBe(
      123456,
    );
    const issues = issuesOf(readRepair(repairRecord({ "Parts Cost": "(12.50)" }), 2));
    expect(issues).toEqual([
      { column: "parts_cost", message: "parts_cost: (12.50) is out of range (0–1,000,000.00)" },
    ]);
    const words = issuesOf(readRepair(repairRecord({ "Labor Cost": "lots" }), 2));
    expect(messages(words)).toEqual([
      "labor_cost: lots is not an amount of money with a decimal point",
    ]);
  });

  test("decimal commas, when the read options say so", () => {
    // common practice (continental Europe)
    const read = readerFor("repairs", REPAIR_HEADERS, { ...OPTIONS, decimalSeparator: "," });
    const row = rowOf(
      read(repairRecord({ "Parts Cost": "1.234,56 €", "Labor Hrs": "1,5", Odometer: "48.210" }), 2),
    );
    expect(row.partsCostCents).toBe(123456);
    expect(row.laborHours).toBe(1.5);
    expect(row.odometerMi).toBe(48210);
    // With a decimal point expected, "1,5" is refused rather than read as 15.
    expect(messages(issuesOf(readRepair(repairRecord({ "Labor Hrs": "1,5" }), 2)))).toEqual([
      "labor_hours: 1,5 is not a number with a decimal point",
    ]);
  });

  test("labour hours above 200 are rejected", () => {
    // Recurra's import brief
    expect(issuesOf(readRepair(repairRecord({ "Labor Hrs": "250" }), 2))[0]?.column).toBe(
      "labor_hours",
    );
  });

  test("odometer: thousands separators, km converted with the exact factor, range checked", () => {
    // NIST SP 811 (1 mi = 1.609344 km); Recurra's import brief (0–2,000,000 mi)
    const km = readerFor("repairs", REPAIR_HEADERS, { ...OPTIONS, distanceUnit: "km" });
    expect(rowOf(km(repairRecord({ Odometer: "160,934.4" }), 2)).odometerMi).toBeCloseTo(100000, 9);
    const tooFar = issuesOf(readRepair(repairRecord({ Odometer: "2,500,000" }), 2));
    expect(messages(tooFar)).toEqual(["odometer: 2,500,000 mi is out of range (0–2,000,000 mi)"]);
    const kmTooFar = issuesOf(km(repairRecord({ Odometer: "3300000" }), 2));
    expect(messages(kmTooFar)).toEqual(["odometer: 3300000 km is out of range (0–2,000,000 mi)"]);
    const negative = issuesOf(readRepair(repairRecord({ Odometer: "-5" }), 2));
    expect(messages(negative)).toEqual(["odometer: -5 mi is out of range (0–2,000,000 mi)"]);
    expect(rowOf(readRepair(repairRecord({ Odometer: "0" }), 2)).odometerMi).toBe(0);
  });

  test("bad codes in a DTC list are dropped with a warning", () => {
    // SAE J2012: P99999 has six characters, X is no area letter
    const result = readRepair(repairRecord({ Codes: "P0441; P99999, X0300 p0455" }), 2);
    expect(rowOf(result).dtcCodes).toEqual(["P0441", "P0455"]);
    expect(result.ok && result.warnings).toEqual([
      {
        column: "dtc_codes",
        message: "dtc_codes: P99999, X0300 are not DTCs (SAE J2012 structure) and left out.",
      },
    ]);
    expect(rowOf(readRepair(repairRecord({ Codes: "" }), 2)).dtcCodes).toEqual([]);
    expect(rowOf(readRepair(repairRecord({ Codes: "none" }), 2)).dtcCodes).toEqual([]);
  });

  test("a VIN with O or I is dropped with a warning when a unit number names the vehicle", () => {
    // 49 CFR 565.4: I, O and Q never appear
    const result = readRepair(repairRecord({ VIN: "1G4AH59H45G11834O" }), 2);
    expect(rowOf(result).vin).toBeNull();
    expect(rowOf(result).unitNumber).toBe("U-17");
    expect(result.ok && result.warnings[0]?.column).toBe("vin");
    expect(result.ok && result.warnings[0]?.message).toMatch(/I, O and Q never appear/);
  });

  test("a malformed VIN rejects the row when there is no unit number", () => {
    // 49 CFR 565: 17 characters
    const issues = issuesOf(readRepair(repairRecord({ VIN: "1G4AH59H45G11", Unit: "" }), 2));
    expect(issues[0]?.column).toBe("vin");
    expect(issues[0]?.message).toMatch(/is not a VIN .*17 characters.*no unit number/);
    expect(issues).toHaveLength(1);
  });

  test("a placeholder VIN is treated as missing", () => {
    // trade-facts.md: 11111111111111111 passes the check digit but is a placeholder
    const withUnit = readRepair(repairRecord({ VIN: "11111111111111111" }), 2);
    expect(rowOf(withUnit).vin).toBeNull();
    expect(withUnit.ok && withUnit.warnings[0]?.message).toMatch(/placeholder/);
    const alone = issuesOf(readRepair(repairRecord({ VIN: "11111111111111111", Unit: "" }), 2));
    expect(messages(alone)).toEqual([
      "vin: the row has neither a usable VIN nor a unit number; give one",
      "vin: 11111111111111111 is a placeholder, not a real VIN; treated as missing.",
    ]);
  });

  test("a wrong check digit is a warning and the VIN is kept", () => {
    // 49 CFR 565 worked examples (trade-facts.md), one character changed: the check digit
    // in position 9 no longer matches
    for (const [valid, changed] of [
      ["1G4AH59H45G118341", "1G4AH59H45G118342"],
      ["1M8GDM9AXKP042788", "1M8GDM9AXKP042789"],
      ["1J9RP1A36A1644345", "1J9RP1A36A1644346"],
    ] as const) {
      const ok = readRepair(repairRecord({ VIN: valid }), 2);
      expect(ok.ok && ok.warnings, valid).toEqual([]);
      const warned = readRepair(repairRecord({ VIN: changed, Unit: "" }), 2);
      expect(rowOf(warned).vin, changed).toBe(changed);
      expect(warned.ok && warned.warnings[0]?.message).toMatch(/Check digit is .*49 CFR 565/);
    }
  });

  test("VINs are normalised to upper case without spaces", () => {
    // 49 CFR 565 (VINs are written in capitals); normalising input is Recurra's rule
    expect(rowOf(readRepair(repairRecord({ VIN: " 1g4ah59h45g118341 " }), 2)).vin).toBe(
      "1G4AH59H45G118341",
    );
  });

  test("formula-like cells are kept as plain text, never evaluated", () => {
    // Recurra's rule (exports neutralise them: csv-export.ts)
    const formula = '=HYPERLINK("http://example.invalid","click")';
    const row = rowOf(readRepair(repairRecord({ Complaint: formula, Component: "=1+1" }), 2));
    expect(row.complaint).toBe(formula);
    expect(row.componentText).toBe("=1+1");
  });

  test("too many fields reject the row, even empty ones: the columns cannot be trusted", () => {
    // Recurra's rule (the import issue: a stray delimiter shifts every value after it)
    const extra = readRepair([...repairRecord(), "surprise", ""], 2);
    expect(issuesOf(extra)).toEqual([
      { column: "", message: "row has 16 fields, the header has 14" },
    ]);
    const emptyExtra = readRepair([...repairRecord(), "", " "], 2);
    expect(messages(issuesOf(emptyExtra))).toEqual(["row has 16 fields, the header has 14"]);
    const exact = readRepair(repairRecord(), 2);
    expect(exact.ok && exact.warnings).toEqual([]);
  });

  test("too few fields: read as blanks with a warning; a missing required one rejects", () => {
    // Recurra's rule (exports drop trailing empty cells)
    const result = readRepair(repairRecord().slice(0, 6), 2);
    const short = rowOf(result);
    expect(short.complaint).toBeNull();
    expect(short.dtcCodes).toEqual([]);
    expect(short.isWarranty).toBe(false);
    expect(short.symptom).toBeNull();
    expect(result.ok && result.warnings).toEqual([
      { column: "", message: "row has 6 fields, the header has 14, read as blank" },
    ]);
    const tooShort = issuesOf(readRepair(repairRecord().slice(0, 3), 2));
    expect(tooShort).toEqual([
      { column: "opened_on", message: "opened_on: a value is required" },
      { column: "", message: "row has 3 fields, the header has 14, read as blank" },
    ]);
  });

  test("placeholder words count as empty", () => {
    // common practice: exports write N/A, -, none for nothing
    const row = rowOf(
      readRepair(repairRecord({ "Date Out": "N/A", "Labor Hrs": "-", Warranty: "" }), 2),
    );
    expect(row.closedOn).toBeNull();
    expect(row.laborHours).toBeNull();
    expect(row.isWarranty).toBe(false);
    expect(issuesOf(readRepair(repairRecord({ "RO #": "n/a" }), 2))[0]?.message).toBe(
      "ro_number: a value is required",
    );
  });

  test("warranty flag: yes/no words; anything else rejects", () => {
    // common practice; Recurra's rule for unreadable values
    expect(rowOf(readRepair(repairRecord({ Warranty: "x" }), 2)).isWarranty).toBe(true);
    expect(rowOf(readRepair(repairRecord({ Warranty: "No" }), 2)).isWarranty).toBe(false);
    expect(messages(issuesOf(readRepair(repairRecord({ Warranty: "maybe" }), 2)))).toEqual([
      "is_warranty: maybe is not yes or no",
    ]);
  });

  test("symptom: the column when it is known, else from the complaint", () => {
    // Recurra's rule
    expect(rowOf(readRepair(repairRecord({ Symptom: "No Start" }), 2)).symptom).toBe("no-start");
    const unknown = readRepair(repairRecord({ Symptom: "wobbly" }), 2);
    expect(rowOf(unknown).symptom).toBe("stall");
    expect(unknown.ok && unknown.warnings[0]?.column).toBe("symptom");
    expect(rowOf(readRepair(repairRecord({ Complaint: "PM service" }), 2)).symptom).toBe("other");
    expect(rowOf(readRepair(repairRecord({ Complaint: "" }), 2)).symptom).toBeNull();
  });

  test("several problems are reported together, errors before warnings", () => {
    // Recurra's rule
    const issues = issuesOf(
      readRepair(repairRecord({ "Date In": "yesterday", "Labor Hrs": "x", Codes: "P0441 Q1" }), 2),
    );
    expect(issues.map((i) => i.column)).toEqual(["opened_on", "labor_hours", "dtc_codes"]);
  });

  test("blank records are rejected as empty", () => {
    // Recurra's rule
    expect(isBlankRecord(["", " ", "N/A"])).toBe(true);
    expect(isBlankRecord(["", "x"])).toBe(false);
    expect(messages(issuesOf(readRepair(["", "", ""], 9)))).toEqual(["The row is empty."]);
  });

  test("a mapping that points outside the header row is refused when the reader is built", () => {
    // Recurra's rule
    expect(() => createRowReader("repairs", ["RO"], { ro_number: 3 }, OPTIONS)).toThrow(
      /ro_number points at column 4/,
    );
  });
});

describe("faults", () => {
  const headers = ["Unit", "Timestamp", "Odometer", "DTC", "MIL", "Status"];
  const read = readerFor("faults", headers);

  test("a good event", () => {
    // SAE J2012 (code), SAE J1979 status terms
    const row = rowOf(read(["U-17", "05/03/2024 14:30", "48210", "p0441", "on", "Pending"], 2));
    expect(row).toMatchObject({
      unitNumber: "U-17",
      occurredAt: "2024-03-05T14:30:00",
      odometerMi: 48210,
      dtc: "P0441",
      milOn: true,
      status: "pending",
    });
  });

  test("a single bad DTC rejects the row", () => {
    // SAE J2012: X is no area letter; P99999 has six characters
    for (const bad of ["X0300", "P99999"]) {
      const issues = issuesOf(read(["U-17", "05/03/2024 14:30", "1", bad, "", ""], 2));
      expect(issues[0]?.column).toBe("dtc");
      expect(issues[0]?.message).toMatch(new RegExp(`^dtc: ${bad} is not a DTC \\(SAE J2012`));
    }
  });

  test("status defaults to confirmed; unknown status and missing time reject", () => {
    // Recurra's rule (the database default is confirmed)
    expect(rowOf(read(["U-17", "05/03/2024", "", "P0300", "", ""], 2)).status).toBe("confirmed");
    expect(rowOf(read(["U-17", "05/03/2024", "", "P0300", "", ""], 2)).milOn).toBe(false);
    expect(issuesOf(read(["U-17", "05/03/2024", "", "P0300", "", "cleared"], 2))[0]?.column).toBe(
      "status",
    );
    expect(issuesOf(read(["U-17", "", "", "P0300", "", ""], 2))[0]?.message).toBe(
      "occurred_at: a value is required",
    );
  });
});

describe("fuel", () => {
  const headers = ["Unit", "Date", "Odometer", "Volume", "UOM", "Total", "Station"];
  const read = readerFor("fuel", headers);

  test("US gallons to litres with the exact factor; per-row unit column", () => {
    // NIST SP 811: 1 US gal = 3.785411784 L, 1 imp gal = 4.54609 L
    const us = rowOf(
      read(["U-17", "05/03/2024 07:10", "48,100", "10", "", "$35.90", "Main St"], 2),
    );
    expect(us.volumeL).toBeCloseTo(37.85411784, 12); // absolute tolerance 1e-12
    expect(us.priceTotalCents).toBe(3590);
    expect(us.filledAt).toBe("2024-03-05T07:10:00");
    const litres = rowOf(read(["U-17", "05/03/2024", "48,100", "40", "L", "60", ""], 2));
    expect(litres.volumeL).toBe(40);
    const imperial = rowOf(read(["U-17", "05/03/2024", "", "10", "imp gal", "", ""], 2));
    expect(imperial.volumeL).toBeCloseTo(45.4609, 12);
  });

  test("volume above 2,000 L and unknown units are rejected", () => {
    // Recurra's import brief (0–2,000 L)
    expect(issuesOf(read(["U-17", "05/03/2024", "", "600", "gal", "", ""], 2))[0]?.message).toBe(
      "volume: 600 us-gal is out of range (0–2,000 L)",
    );
    expect(issuesOf(read(["U-17", "05/03/2024", "", "6", "kg", "", ""], 2))[0]?.column).toBe(
      "volume_unit",
    );
  });
});

describe("vehicles", () => {
  const headers = ["Unit", "VIN", "Make", "Model", "Year", "Odometer", "Odometer Unit"];
  const read = readerFor("vehicles", headers);

  test("a good vehicle, its own odometer unit, and a two-digit model year", () => {
    // NIST SP 811; Recurra's rule for the two-digit year (pivot 80)
    const row = rowOf(read(["U-17", "", "Aurel", "Kestrel", "19", "160934.4", "km"], 2));
    expect(row).toMatchObject({ make: "Aurel", modelYear: 2019, odometerUnit: "km", vin: null });
    expect(row.odometerMi).toBeCloseTo(100000, 9);
    expect(rowOf(read(["U-17", "", "Aurel", "Kestrel", "2019", "", ""], 2)).odometerUnit).toBe(
      "mi",
    );
  });

  test("model year outside 1980–2040 and a missing make are rejected", () => {
    // Recurra's import brief
    expect(messages(issuesOf(read(["U-17", "", "Aurel", "Kestrel", "1979", "", ""], 2)))).toEqual([
      "model_year: 1979 is out of range (1980–2040)",
    ]);
    expect(issuesOf(read(["U-17", "", "", "Kestrel", "2019", "", ""], 2))[0]?.column).toBe("make");
    expect(issuesOf(read(["", "", "Aurel", "Kestrel", "2019", "", ""], 2))[0]?.column).toBe("vin");
  });
});

describe("parts and generations", () => {
  test("parts: whole quantities, money, required description", () => {
    // Recurra's import brief
    const read = readerFor("parts", [
      "Part #",
      "Description",
      "Qty On Hand",
      "Unit Cost",
      "Lead Time",
    ]);
    expect(rowOf(read(["PV-1", "Purge valve", "1,200", "$24.50", "3"], 2))).toEqual({
      partNumber: "PV-1",
      description: "Purge valve",
      componentText: null,
      onHand: 1200,
      unitCostCents: 2450,
      leadTimeDays: 3,
    });
    expect(messages(issuesOf(read(["PV-1", "Purge valve", "12.5", "", ""], 2)))).toEqual([
      "on_hand: 12.5 is not a whole number",
    ]);
    expect(issuesOf(read(["PV-1", "", "1", "", ""], 2))[0]?.column).toBe("description");
  });

  test("generations: years in range and in order", () => {
    // Recurra's import brief
    const read = readerFor("generations", ["Make", "Model", "Generation", "Year From", "Year To"]);
    expect(rowOf(read(["Aurel", "Kestrel", "K2", "2014", "2019"], 2))).toEqual({
      make: "Aurel",
      model: "Kestrel",
      generation: "K2",
      yearFrom: 2014,
      yearTo: 2019,
      powertrain: null,
    });
    const withPowertrain = readerFor("generations", [
      "Make",
      "Model",
      "Generation",
      "Year From",
      "Year To",
      "Powertrain",
    ]);
    expect(
      rowOf(withPowertrain(["Aurel", "Kestrel", "K3h", "2021", "2025", "Hybrid"], 2)),
    ).toMatchObject({
      powertrain: "hybrid",
    });
    expect(
      rowOf(withPowertrain(["Aurel", "Kestrel", "K3e", "2021", "2025", "BEV"], 2)),
    ).toMatchObject({
      powertrain: "electric",
    });
    expect(messages(issuesOf(read(["Aurel", "Kestrel", "K2", "2019", "2014"], 2)))).toEqual([
      "year_to: 2014 is before year_from (2019)",
    ]);
  });
});

describe("row schemas", () => {
  test("every kind compiles with z.compile (no silent fall-back to the slow parser)", () => {
    // Recurra's rule: the row readers rely on zod's compiled validator for speed
    const schemas = buildRowSchemas("2025-07-01");
    for (const kind of IMPORT_KINDS) {
      expect(() => z.compile(schemas[kind] as z.ZodType, { strict: true }), kind).not.toThrow();
    }
  });

  test("today must be a date", () => {
    // Recurra's rule
    expect(() => dayAfter("30/06/2025")).toThrow(/today must be a date/);
    expect(dayAfter("2024-02-28")).toBe("2024-02-29");
    expect(dayAfter("2024-12-31")).toBe("2025-01-01");
  });
});

describe("columnKeyOfField", () => {
  test("every typed field names a canonical column of its kind", () => {
    // Recurra's import brief: canonical keys are fixed; typed fields carry units in their names
    const schemas = buildRowSchemas("2025-07-01");
    for (const kind of IMPORT_KINDS) {
      const keys = IMPORT_COLUMNS[kind].map((c) => c.key);
      for (const field of Object.keys(schemas[kind].shape)) {
        expect(keys, `${kind}.${field}`).toContain(columnKeyOfField(field));
      }
    }
    expect(columnKeyOfField("partsCostCents")).toBe("parts_cost");
    expect(columnKeyOfField("volumeL")).toBe("volume");
  });
});
