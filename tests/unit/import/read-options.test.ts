import { describe, expect, test } from "vitest";

import { autoMapHeaders } from "@/lib/import/mapping";
import { detectReadOptions } from "@/lib/import/read-options";

// Sources: how dates, numbers and units are written in exports ("common practice"); the
// decisions and defaults are "Recurra's rule" (lib/import/read-options.ts).

const REPAIR_HEADERS = ["RO", "Unit", "Date In", "Miles In", "Labor Hrs", "Parts Cost"];

function detect(
  headers: string[],
  rows: string[][],
  kind: "repairs" | "fuel" | "vehicles" = "repairs",
) {
  const { mapping } = autoMapHeaders(kind, headers);
  return detectReadOptions(kind, headers, rows, mapping);
}

const repairRows = (dates: string[], numbers: string[] = ["1.5"]) =>
  dates.map((d, i) => {
    const n = numbers[i % numbers.length] ?? "";
    return ["RO" + i, "U1", d, "12000", n, n];
  });

describe("date format", () => {
  test("a first part above 12 decides day-first, and the reason names the column and value", () => {
    // common practice
    const r = detect(REPAIR_HEADERS, repairRows(["03/04/2024", "25/04/2024"]));
    expect(r.options.dateFormat).toBe("dmy");
    expect(r.isAmbiguous.dateFormat).toBe(false);
    expect(r.dateOrder).toMatchObject({ status: "decided", format: "dmy", count: 1 });
    expect(r.reasons[0]).toBe(
      "Dates are read day/month/year: “Date In” has 25/04/2024, which can only be 25 April 2024.",
    );
  });

  test("a second part above 12 decides month-first", () => {
    // common practice
    const r = detect(REPAIR_HEADERS, repairRows(["03/04/2024", "04/25/2024"]));
    expect(r.options.dateFormat).toBe("mdy");
    expect(r.isAmbiguous.dateFormat).toBe(false);
    expect(r.reasons[0]).toMatch(/“Date In” has 04\/25\/2024, which can only be 25 April 2024/);
  });

  test("year-first dates are ISO, never ambiguous", () => {
    // ISO 8601
    const r = detect(REPAIR_HEADERS, repairRows(["2024-04-03", "2024-12-05"]));
    expect(r.options.dateFormat).toBe("iso");
    expect(r.isAmbiguous.dateFormat).toBe(false);
    expect(r.dateOrder).toEqual({ status: "iso" });
  });

  test("dates that fit both orders are a question, slashes or dots alike; the default only fills the place", () => {
    // Recurra's rule: never a guess (the import issue)
    for (const dates of [
      ["03/04/2024", "05/06/2024"],
      ["03.04.2024", "05.06.2024"],
    ]) {
      const r = detect(REPAIR_HEADERS, repairRows(dates));
      expect(r.isAmbiguous.dateFormat, dates[0]).toBe(true);
      expect(r.dateOrder.status, dates[0]).toBe("ask");
      expect(r.options.dateFormat).toBe("mdy");
      expect(r.reasons[0]).toMatch(/fit both day\/month\/year and month\/day\/year/);
    }
    const org = detectReadOptions(
      "repairs",
      REPAIR_HEADERS,
      repairRows(["03/04/2024"]),
      autoMapHeaders("repairs", REPAIR_HEADERS).mapping,
      { dateFormat: "dmy" },
    );
    expect(org.options.dateFormat).toBe("dmy");
    expect(org.dateOrder.status).toBe("ask");
  });

  test("contradicting dates are a question too", () => {
    // Recurra's rule
    const r = detect(REPAIR_HEADERS, repairRows(["25/04/2024", "04/25/2024", "26/04/2024"]));
    expect(r.isAmbiguous.dateFormat).toBe(true);
    expect(r.dateOrder).toMatchObject({ status: "ask", isConflict: true });
    expect(r.reasons[0]).toMatch(
      /^Dates disagree: “Date In” \(for example 25\/04\/2024 and 04\/25\/2024\)/,
    );
  });
});

describe("decimal separator", () => {
  test('"12,5" means a decimal comma', () => {
    // common practice
    const r = detect(REPAIR_HEADERS, repairRows(["2024-01-01"], ["12,5", "3"]));
    expect(r.options.decimalSeparator).toBe(",");
    expect(r.isAmbiguous.decimalSeparator).toBe(false);
  });

  test('"1.234,56" means a decimal comma; "1,234.56" a decimal point', () => {
    // common practice
    expect(
      detect(REPAIR_HEADERS, repairRows(["2024-01-01"], ["1.234,56"])).options.decimalSeparator,
    ).toBe(",");
    expect(
      detect(REPAIR_HEADERS, repairRows(["2024-01-01"], ["1,234.56"])).options.decimalSeparator,
    ).toBe(".");
  });

  test("contradicting separators are flagged", () => {
    // Recurra's rule
    const r = detect(REPAIR_HEADERS, repairRows(["2024-01-01", "2024-01-02"], ["12,5", "10.25"]));
    expect(r.isAmbiguous.decimalSeparator).toBe(true);
    expect(r.reasons[1]).toMatch(/disagree/);
  });

  test('"1,234" alone decides nothing', () => {
    // Recurra's rule
    const rows = repairRows(["2024-01-01"], ["1,234"]).map((r) => [
      ...r.slice(0, 3),
      "1,234",
      "1,234",
      "1,234",
    ]);
    const r = detect(REPAIR_HEADERS, rows);
    expect(r.options.decimalSeparator).toBe(".");
    expect(r.isAmbiguous.decimalSeparator).toBe(true);
  });

  test("text columns with commas are not numbers", () => {
    // Recurra's rule
    const headers = ["RO", "Unit", "Date", "Complaint"];
    const r = detect(headers, [["1", "U1", "2024-01-01", "stalls, then dies,5"]]);
    expect(r.options.decimalSeparator).toBe(".");
    expect(r.isAmbiguous.decimalSeparator).toBe(false);
  });
});

describe("units", () => {
  test.each([
    ["Odometer (km)", "Litres", "km", "l"],
    ["Miles", "Gallons", "mi", "us-gal"],
    ["Odometer", "Volume (imp gal)", "mi", "imp-gal"],
  ])("from words in the headers: %s, %s", (odometer, volume, distanceUnit, volumeUnit) => {
    // common practice (a bare "gallons" as US gallons is Recurra's rule)
    const r = detect(["Unit", "Date", odometer, volume], [["U1", "2024-01-01", "1", "1"]], "fuel");
    expect(r.options.distanceUnit).toBe(distanceUnit);
    expect(r.options.volumeUnit).toBe(volumeUnit);
  });

  test("a unit column wins over the header; 'mileage' says nothing", () => {
    // Recurra's rule
    const headers = ["Unit", "Date", "Mileage", "Volume", "UOM"];
    const r = detect(
      headers,
      [
        ["U1", "2024-01-01", "1", "40", "L"],
        ["U2", "2024-01-01", "1", "40", "litres"],
      ],
      "fuel",
    );
    expect(r.options.volumeUnit).toBe("l");
    expect(r.options.distanceUnit).toBe("mi");
    expect(r.reasons.some((x) => x.includes("not stated"))).toBe(true);
    const vehicles = detect(
      ["Unit", "Make", "Model", "Year", "Odometer", "Odometer Unit"],
      [["U1", "Aurel", "Kestrel", "2019", "1000", "km"]],
      "vehicles",
    );
    expect(vehicles.options.distanceUnit).toBe("km");
  });
});
