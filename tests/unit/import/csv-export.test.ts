import { describe, expect, test } from "vitest";

import { csvSafeCell, toCsv } from "@/lib/import/csv-export";

// Sources: "OWASP CSV injection" (OWASP Foundation, "CSV Injection": cells starting with =, +,
// -, @, tab or carriage return get a leading single quote); "RFC 4180" (CSV quoting and CRLF);
// "Recurra's rule" for plain numbers.

describe("csvSafeCell", () => {
  test("formula triggers get a leading single quote", () => {
    // OWASP CSV injection
    expect(csvSafeCell("=1+1")).toBe("'=1+1");
    expect(csvSafeCell("+SUM(A1:A9)")).toBe("'+SUM(A1:A9)");
    expect(csvSafeCell("-2+3")).toBe("'-2+3");
    expect(csvSafeCell("@cmd")).toBe("'@cmd");
    expect(csvSafeCell("\t=x")).toBe("'\t=x");
    expect(csvSafeCell("\r=x")).toBe("'\r=x");
    expect(csvSafeCell('=HYPERLINK("http://example.invalid","x")')).toBe(
      `'=HYPERLINK("http://example.invalid","x")`,
    );
  });

  test("plain numbers stay numbers; ordinary text is untouched", () => {
    // Recurra's rule
    expect(csvSafeCell("-12.5")).toBe("-12.5");
    expect(csvSafeCell("+3")).toBe("+3");
    expect(csvSafeCell(-12.5)).toBe("-12.5");
    expect(csvSafeCell("-12.5e3")).toBe("'-12.5e3");
    expect(csvSafeCell("- 12")).toBe("'- 12");
    expect(csvSafeCell("Purge valve")).toBe("Purge valve");
    expect(csvSafeCell("a=b")).toBe("a=b");
    expect(csvSafeCell(null)).toBe("");
    expect(csvSafeCell(undefined)).toBe("");
    expect(csvSafeCell(true)).toBe("true");
    expect(csvSafeCell(Number.NaN)).toBe("");
  });
});

describe("toCsv", () => {
  test("RFC 4180 quoting and CRLF line ends", () => {
    // RFC 4180 §2
    const csv = toCsv(
      ["code", "note"],
      [
        ["P0441", "purge, valve"],
        ["P0455", 'says "large leak"'],
        ["P0456", "two\nlines"],
        ["P0457", null],
      ],
    );
    expect(csv).toBe(
      'code,note\r\nP0441,"purge, valve"\r\nP0455,"says ""large leak"""\r\nP0456,"two\nlines"\r\nP0457,\r\n',
    );
  });

  test("cells are neutralised before quoting, headers too", () => {
    // OWASP CSV injection, then RFC 4180
    expect(toCsv(["=cmd"], [["=1,2"], [-5]])).toBe("'=cmd\r\n\"'=1,2\"\r\n-5\r\n");
  });

  test("optional byte-order mark", () => {
    // common practice: some spreadsheet programs need it to read UTF-8
    expect(toCsv(["é"], [], { withBom: true })).toBe("\uFEFFé\r\n");
    expect(toCsv(["é"], [])).toBe("é\r\n");
  });
});
