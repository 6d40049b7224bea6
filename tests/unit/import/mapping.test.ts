import { describe, expect, test } from "vitest";

import { IMPORT_KINDS } from "@/db/schema/operations";
import {
  IMPORT_COLUMNS,
  VEHICLE_KEY_REQUIREMENT,
  VEHICLE_KEYS,
  needsVehicleKey,
} from "@/lib/import/columns";
import { autoMapHeaders, guessKind, normaliseHeader, validateMapping } from "@/lib/import/mapping";

// Sources: header words are "common practice" (how spreadsheets and exports name columns);
// the matching rules are "Recurra's rule" (lib/import/mapping.ts).

describe("normaliseHeader", () => {
  test("case, spacing, punctuation and a byte-order mark do not matter", () => {
    // Recurra's rule
    expect(normaliseHeader("\uFEFFRO Number")).toBe("ro no");
    expect(normaliseHeader("  ro   number  ")).toBe("ro no");
    expect(normaliseHeader("Date_In")).toBe("date in");
    expect(normaliseHeader("Warranty?")).toBe("warranty");
    expect(normaliseHeader("Odometer (km)")).toBe("odometer km");
    expect(normaliseHeader("Kilomètres")).toBe("kilometres");
  });

  test('"#", "no", "no.", "number", "num" and "nr" are one word', () => {
    // Recurra's rule
    for (const h of ["RO #", "RO#", "RO No.", "RO Number", "ro num", "RO Nr", "ro_no"]) {
      expect(normaliseHeader(h), h).toBe("ro no");
    }
  });

  test("camelCase and snake_case split into words", () => {
    // Recurra's rule
    expect(normaliseHeader("unitNumber")).toBe("unit no");
    expect(normaliseHeader("model_year")).toBe("model year");
    expect(normaliseHeader("VIN")).toBe("vin");
  });
});

describe("column lists", () => {
  test("no normalised synonym names two columns of one kind", () => {
    // Recurra's rule: a header must never be ambiguous within a kind
    for (const kind of IMPORT_KINDS) {
      const owner = new Map<string, string>();
      for (const spec of IMPORT_COLUMNS[kind]) {
        for (const word of [spec.key, spec.label, ...spec.synonyms]) {
          const norm = normaliseHeader(word);
          const seen = owner.get(norm);
          expect(seen === undefined || seen === spec.key, `${kind}: "${word}"`).toBe(true);
          owner.set(norm, spec.key);
        }
      }
    }
  });

  test("required columns are those of the import brief", () => {
    // Recurra's import brief (the canonical columns are fixed)
    const required = (kind: (typeof IMPORT_KINDS)[number]) =>
      IMPORT_COLUMNS[kind].filter((c) => c.isRequired).map((c) => c.key);
    expect(required("vehicles")).toEqual(["make", "model", "model_year"]);
    expect(required("repairs")).toEqual(["ro_number", "opened_on"]);
    expect(required("faults")).toEqual(["occurred_at", "dtc"]);
    expect(required("fuel")).toEqual(["filled_at"]);
    expect(required("parts")).toEqual(["part_number", "description"]);
    expect(required("generations")).toEqual([
      "make",
      "model",
      "generation",
      "year_from",
      "year_to",
    ]);
    expect(VEHICLE_KEYS).toEqual(["vin", "unit_number"]);
    expect(IMPORT_KINDS.filter(needsVehicleKey)).toEqual(["vehicles", "repairs", "faults", "fuel"]);
  });
});

describe("autoMapHeaders", () => {
  test("maps trade words for a repair-order export", () => {
    // common practice
    const headers = [
      "RO #",
      "Unit #",
      "VIN",
      "Date In",
      "Date Out",
      "Miles In",
      "Customer Concern",
      "Cause",
      "Work Performed",
      "Trouble Codes",
      "Labor Hrs",
      "Parts $",
      "Tech",
      "Warranty?",
    ];
    const { mapping, unmatchedHeaders, missingRequired } = autoMapHeaders("repairs", headers);
    expect(mapping).toMatchObject({
      ro_number: 0,
      unit_number: 1,
      vin: 2,
      opened_on: 3,
      closed_on: 4,
      odometer: 5,
      complaint: 6,
      cause: 7,
      correction: 8,
      dtc_codes: 9,
      labor_hours: 10,
      parts_cost: 11,
      technician: 12,
      is_warranty: 13,
      labor_cost: null,
      symptom: null,
    });
    expect(unmatchedHeaders).toEqual([]);
    expect(missingRequired).toEqual([]);
  });

  test("synonyms: work order, fleet no, mileage, open date, odo, asset", () => {
    // common practice
    expect(
      autoMapHeaders("repairs", ["Work Order", "Fleet No", "Open Date", "Mileage"]).mapping,
    ).toMatchObject({ ro_number: 0, unit_number: 1, opened_on: 2, odometer: 3 });
    expect(
      autoMapHeaders("repairs", ["repair order no", "asset", "date", "odo"]).mapping,
    ).toMatchObject({ ro_number: 0, unit_number: 1, opened_on: 2, odometer: 3 });
  });

  test("units in brackets are looked past, but exact matches come first", () => {
    // Recurra's rule
    const { mapping } = autoMapHeaders("fuel", ["Unit", "Date", "Odometer (km)", "Volume (L)"]);
    expect(mapping).toMatchObject({ unit_number: 0, filled_at: 1, odometer: 2, volume: 3 });
    // "km" is itself an odometer synonym, so it wins over the looser "Odometer (mi)".
    const later = autoMapHeaders("fuel", ["Odometer (mi)", "km", "Unit", "Date"]);
    expect(later.mapping.odometer).toBe(1);
    expect(later.unmatchedHeaders).toEqual(["Odometer (mi)"]);
  });

  test("fault and fuel words", () => {
    // common practice
    expect(
      autoMapHeaders("faults", ["Asset ID", "Timestamp", "Trouble Code", "MIL", "Status"]).mapping,
    ).toMatchObject({ unit_number: 0, occurred_at: 1, dtc: 2, mil_on: 3, status: 4 });
    expect(autoMapHeaders("faults", ["unit", "time", "DTC", "lamp on"]).mapping).toMatchObject({
      unit_number: 0,
      occurred_at: 1,
      dtc: 2,
      mil_on: 3,
    });
    expect(
      autoMapHeaders("fuel", ["Card Unit", "Transaction Date", "Gallons", "Total", "Site"]).mapping,
    ).toMatchObject({ filled_at: 1, volume: 2, price_total: 3, station: 4, unit_number: null });
    expect(autoMapHeaders("parts", ["Part #", "Description", "Qty On Hand"]).mapping).toMatchObject(
      { part_number: 0, description: 1, on_hand: 2 },
    );
  });

  test("a header takes one column only; the second candidate stays unmatched", () => {
    // Recurra's rule
    const { mapping, unmatchedHeaders } = autoMapHeaders("repairs", [
      "RO",
      "Date In",
      "Open Date",
      "Unit",
    ]);
    expect(mapping.opened_on).toBe(1);
    expect(unmatchedHeaders).toEqual(["Open Date"]);
  });

  test("reports duplicated header names and ignores empty headers", () => {
    // common practice: exports repeat "Notes" or leave trailing columns unnamed
    const result = autoMapHeaders("repairs", ["RO", "Date", "Unit", "Notes", "notes", "", ""]);
    expect(result.duplicateHeaders).toEqual(["Notes"]);
    expect(result.unmatchedHeaders).toEqual(["Notes", "notes"]);
  });

  test("lists missing required columns, and the vehicle key as one requirement", () => {
    // Recurra's import brief
    expect(autoMapHeaders("repairs", ["Complaint", "Cause"]).missingRequired).toEqual([
      "ro_number",
      "opened_on",
      VEHICLE_KEY_REQUIREMENT,
    ]);
    expect(autoMapHeaders("repairs", ["RO", "Date", "VIN"]).missingRequired).toEqual([]);
    expect(autoMapHeaders("parts", ["Part No", "Desc"]).missingRequired).toEqual([]);
  });
});

describe("validateMapping", () => {
  const headers = ["RO", "Date", "Date", "Unit", "Complaint"];

  test("a complete mapping has no problems", () => {
    // Recurra's rule
    const { mapping } = autoMapHeaders("repairs", ["RO", "Date", "Unit"]);
    expect(validateMapping("repairs", ["RO", "Date", "Unit"], mapping)).toEqual([]);
  });

  test("missing required column and missing vehicle key", () => {
    // Recurra's import brief
    const problems = validateMapping("repairs", headers, { ro_number: 0 });
    expect(problems).toEqual([
      "Opened on (opened_on) is required; choose the column that holds it.",
      "Choose a VIN or a unit number column; every row needs at least one of them.",
    ]);
  });

  test("a column used twice, an index out of range and an unknown key", () => {
    // Recurra's rule
    const problems = validateMapping("repairs", headers, {
      ro_number: 0,
      opened_on: 1,
      closed_on: 1,
      unit_number: 3,
      complaint: 9,
      colour: 2,
    });
    expect(problems).toContain('"colour" is not a column of a repairs import.');
    expect(problems).toContain(
      "Complaint (complaint) points at column 10, but the file has 5 columns.",
    );
    expect(problems).toContain(
      'Column 2 ("Date") is used for opened_on and closed_on; a column can fill only one.',
    );
  });

  test("a mapped column whose name occurs twice in the file", () => {
    // Recurra's rule
    const problems = validateMapping("repairs", headers, {
      ro_number: 0,
      opened_on: 2,
      unit_number: 3,
    });
    expect(problems).toEqual([
      'The file has 2 columns named "Date" (columns 2, 3); check that opened_on uses the right one.',
    ]);
  });
});

describe("guessKind", () => {
  test("tells a fuel file from a repairs file", () => {
    // common practice: a fuel-card export
    const fuel = guessKind(["Unit", "Date", "Odometer", "Gallons", "Total", "Station"]);
    expect(fuel[0]?.kind).toBe("fuel");
    expect(fuel[0]?.missingRequired).toEqual([]);
    const repairsGuess = fuel.find((g) => g.kind === "repairs");
    expect(repairsGuess?.missingRequired).toEqual(["ro_number"]);
    expect((repairsGuess?.score ?? 1) < (fuel[0]?.score ?? 0)).toBe(true);
  });

  test("repairs, faults, vehicles, parts and generations files", () => {
    // common practice
    expect(
      guessKind(["RO #", "Unit", "Date In", "Miles", "Complaint", "Correction"])[0]?.kind,
    ).toBe("repairs");
    expect(guessKind(["Unit", "Timestamp", "DTC", "MIL", "Odometer"])[0]?.kind).toBe("faults");
    expect(guessKind(["Unit #", "VIN", "Make", "Model", "Year", "Engine"])[0]?.kind).toBe(
      "vehicles",
    );
    expect(guessKind(["Part #", "Description", "On Hand", "Unit Cost"])[0]?.kind).toBe("parts");
    expect(guessKind(["Make", "Model", "Generation", "Year From", "Year To"])[0]?.kind).toBe(
      "generations",
    );
  });

  test("scores lie in 0–1, sorted best first; no headers score 0", () => {
    // Recurra's rule
    const guesses = guessKind(["RO", "Date", "Unit"]);
    expect(guesses).toHaveLength(IMPORT_KINDS.length);
    for (let i = 1; i < guesses.length; i++) {
      expect((guesses[i - 1]?.score ?? 0) >= (guesses[i]?.score ?? 0)).toBe(true);
    }
    expect(guesses.every((g) => g.score >= 0 && g.score <= 1)).toBe(true);
    expect(guessKind(["", ""]).every((g) => g.score === 0)).toBe(true);
  });
});
