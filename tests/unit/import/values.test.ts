import { describe, expect, test } from "vitest";

import {
  expandTwoDigitYear,
  parseBoolean,
  parseDate,
  parseDecimal,
  parseDistanceUnit,
  parseInteger,
  parseMoneyCents,
  parseTimestamp,
  parseVolumeUnit,
  parseYear,
  toLitres,
  toMiles,
} from "@/lib/import/values";

// Sources, as labelled beside each expected value:
// - "Gregorian calendar": month lengths and the leap-year rule.
// - "NIST SP 811": exact conversion factors (1 mi = 1.609344 km, 1 US gal = 3.785411784 L,
//   1 imp gal = 4.54609 L), as quoted in trade-facts.md.
// - "common practice": how spreadsheets and exports write dates, numbers and yes/no.
// - "Recurra's rule": a choice made in lib/import/values.ts, not a standard.

describe("parseDate", () => {
  test("ISO, month-first and day-first dates", () => {
    // common practice
    expect(parseDate("2024-03-05", "iso")).toBe("2024-03-05");
    expect(parseDate("3/5/2024", "mdy")).toBe("2024-03-05");
    expect(parseDate("3/5/2024", "dmy")).toBe("2024-05-03");
    expect(parseDate("05.03.2024", "dmy")).toBe("2024-03-05");
    expect(parseDate("05-03-2024", "mdy")).toBe("2024-05-03");
    expect(parseDate("  2024/03/05 ", "dmy")).toBe("2024-03-05");
    expect(parseDate("20240305", "mdy")).toBe("2024-03-05");
  });

  test("year-first dates are ISO whatever the format; other orders need their format", () => {
    // Recurra's rule
    expect(parseDate("2024-12-01", "mdy")).toBe("2024-12-01");
    expect(parseDate("2024-12-01", "dmy")).toBe("2024-12-01");
    expect(parseDate("01/12/2024", "iso")).toBeNull();
  });

  test("impossible dates are refused", () => {
    // Gregorian calendar
    expect(parseDate("31/02/2024", "dmy")).toBeNull();
    expect(parseDate("13/13/2024", "dmy")).toBeNull();
    expect(parseDate("2024-13-01", "iso")).toBeNull();
    expect(parseDate("2024-04-31", "iso")).toBeNull();
    expect(parseDate("0/5/2024", "mdy")).toBeNull();
  });

  test("29 February exists in leap years only", () => {
    // Gregorian calendar: 2024 is a leap year, 2023 is not, 1900 is not, 2000 is.
    expect(parseDate("29/02/2024", "dmy")).toBe("2024-02-29");
    expect(parseDate("29/02/2023", "dmy")).toBeNull();
    expect(parseDate("1900-02-29", "iso")).toBeNull();
    expect(parseDate("2000-02-29", "iso")).toBe("2000-02-29");
  });

  test("two-digit years: 00–79 are 20xx, 80–99 are 19xx", () => {
    // Recurra's rule (TWO_DIGIT_YEAR_PIVOT = 80)
    expect(parseDate("3/5/24", "mdy")).toBe("2024-03-05");
    expect(parseDate("3/5/79", "mdy")).toBe("2079-03-05");
    expect(parseDate("3/5/80", "mdy")).toBe("1980-03-05");
    expect(parseDate("3/5/99", "mdy")).toBe("1999-03-05");
    expect(expandTwoDigitYear(0)).toBe(2000);
    expect(parseDate("3/5/024", "mdy")).toBeNull(); // three digits: no rule
  });

  test("month names and a trailing time", () => {
    // common practice
    expect(parseDate("05-Mar-2024", "mdy")).toBe("2024-03-05");
    expect(parseDate("5 March 2024", "mdy")).toBe("2024-03-05");
    expect(parseDate("5-sep-24", "dmy")).toBe("2024-09-05");
    expect(parseDate("5-Mrz-2024", "dmy")).toBeNull();
    expect(parseDate("3/5/2024 00:00", "mdy")).toBe("2024-03-05");
    expect(parseDate("2024-03-05T10:22:00Z", "iso")).toBe("2024-03-05");
    expect(parseDate("2024-03-05 garbage", "iso")).toBeNull();
  });

  test("mixed separators, blanks and words are refused", () => {
    // Recurra's rule
    expect(parseDate("2024-03/05", "iso")).toBeNull();
    expect(parseDate("", "iso")).toBeNull();
    expect(parseDate("yesterday", "mdy")).toBeNull();
    expect(parseDate("5 3 2024", "dmy")).toBeNull();
  });
});

describe("parseTimestamp", () => {
  test("without a zone the wall time is kept as written, with no Z", () => {
    // Recurra's rule
    expect(parseTimestamp("2024-03-05 14:30", "iso")).toBe("2024-03-05T14:30:00");
    expect(parseTimestamp("2024-03-05T14:30:15", "iso")).toBe("2024-03-05T14:30:15");
    expect(parseTimestamp("05/03/2024 07:05:09", "dmy")).toBe("2024-03-05T07:05:09");
    expect(parseTimestamp("2024-03-05", "iso")).toBe("2024-03-05T00:00:00");
    expect(parseTimestamp("2024-03-05 14:30:15.250", "iso")).toBe("2024-03-05T14:30:15");
  });

  test("AM/PM", () => {
    // common practice: 12 AM is midnight, 12 PM is noon
    expect(parseTimestamp("3/5/2024 2:15 PM", "mdy")).toBe("2024-03-05T14:15:00");
    expect(parseTimestamp("3/5/2024 12:00 AM", "mdy")).toBe("2024-03-05T00:00:00");
    expect(parseTimestamp("3/5/2024 12:00 pm", "mdy")).toBe("2024-03-05T12:00:00");
    expect(parseTimestamp("3/5/2024 13:00 PM", "mdy")).toBeNull();
  });

  test("a zone converts the instant to UTC, written with Z", () => {
    // ISO 8601 offsets
    expect(parseTimestamp("2024-03-05T14:30:00Z", "iso")).toBe("2024-03-05T14:30:00Z");
    expect(parseTimestamp("2024-03-05T14:30:00+02:00", "iso")).toBe("2024-03-05T12:30:00Z");
    expect(parseTimestamp("2024-03-05 01:30 -0500", "iso")).toBe("2024-03-05T06:30:00Z");
    expect(parseTimestamp("2024-03-05 23:30 -05", "iso")).toBe("2024-03-06T04:30:00Z");
    expect(parseTimestamp("2024-03-05 10:00 UTC", "iso")).toBe("2024-03-05T10:00:00Z");
  });

  test("impossible times and zones are refused", () => {
    // ISO 8601 ranges
    expect(parseTimestamp("2024-03-05 24:00", "iso")).toBeNull();
    expect(parseTimestamp("2024-03-05 10:60", "iso")).toBeNull();
    expect(parseTimestamp("2024-03-05 10:5", "iso")).toBeNull();
    expect(parseTimestamp("2024-03-05 10:00 CET", "iso")).toBeNull();
    expect(parseTimestamp("2024-03-05 10:00 +2:00", "iso")).toBeNull();
    expect(parseTimestamp("31/02/2024 10:00", "dmy")).toBeNull();
  });
});

describe("parseDecimal", () => {
  test("decimal point with thousands commas, spaces or apostrophes", () => {
    // common practice
    expect(parseDecimal("1,234.56", ".")).toBe(1234.56);
    expect(parseDecimal("1 234.56", ".")).toBe(1234.56);
    expect(parseDecimal("1'234.56", ".")).toBe(1234.56);
    expect(parseDecimal("1,234,567", ".")).toBe(1234567);
    expect(parseDecimal("12.5", ".")).toBe(12.5);
    expect(parseDecimal(".5", ".")).toBe(0.5);
    expect(parseDecimal("  42 ", ".")).toBe(42);
  });

  test("decimal comma with thousands dots or spaces", () => {
    // common practice (continental Europe)
    expect(parseDecimal("1.234,56", ",")).toBe(1234.56);
    expect(parseDecimal("12,5", ",")).toBe(12.5);
    expect(parseDecimal("1 234,5", ",")).toBe(1234.5);
    expect(parseDecimal("1.234", ",")).toBe(1234);
  });

  test("a separator in the wrong role is refused rather than misread", () => {
    // Recurra's rule: "12,5" cannot be a thousands group, so with "." it is no number
    expect(parseDecimal("12,5", ".")).toBeNull();
    expect(parseDecimal("1,23.4", ".")).toBeNull();
    expect(parseDecimal("1234,567", ".")).toBeNull();
    expect(parseDecimal("1.2.3", ".")).toBeNull();
    expect(parseDecimal("1,234 567", ".")).toBeNull(); // two kinds of group separator
    expect(parseDecimal("1.234,56", ".")).toBeNull();
  });

  test("negatives with a minus or parentheses; words and blanks are no numbers", () => {
    // common practice (accounting parentheses)
    expect(parseDecimal("-12.5", ".")).toBe(-12.5);
    expect(parseDecimal("(12.5)", ".")).toBe(-12.5);
    expect(parseDecimal("+3", ".")).toBe(3);
    expect(parseDecimal("-(3)", ".")).toBeNull();
    expect(parseDecimal("", ".")).toBeNull();
    expect(parseDecimal("-", ".")).toBeNull();
    expect(parseDecimal("12 km", ".")).toBeNull();
    expect(parseDecimal("1e5", ".")).toBeNull();
    expect(parseDecimal("$12", ".")).toBeNull();
  });

  test("long digit strings are read by Number, not refused", () => {
    // IEEE 754: the double nearest 0.30000000000000004 is 0.1 + 0.2
    expect(parseDecimal("0.30000000000000004", ".")).toBe(0.1 + 0.2);
    expect(parseDecimal("123456789012345678", ".")).toBe(123456789012345678);
  });

  test("values are correctly rounded, as Number would read them", () => {
    // IEEE 754 round-to-nearest: compare with the engine's own reading of the plain text
    for (const text of ["0.1", "2.675", "1234.5678", "99999.99", "0.000123"]) {
      expect(parseDecimal(text, "."), text).toBe(Number(text));
    }
  });
});

describe("parseMoneyCents", () => {
  test("currency symbols and codes are stripped", () => {
    // common practice
    expect(parseMoneyCents("$1,234.56", ".")).toBe(123456);
    expect(parseMoneyCents("1.234,56 €", ",")).toBe(123456);
    expect(parseMoneyCents("USD 12", ".")).toBe(1200);
    expect(parseMoneyCents("£ 0.5", ".")).toBe(50);
    expect(parseMoneyCents("12.30 EUR", ".")).toBe(1230);
  });

  test("negatives: minus sign, minus before or after the symbol, parentheses", () => {
    // common practice (accounting parentheses)
    expect(parseMoneyCents("(12.50)", ".")).toBe(-1250);
    expect(parseMoneyCents("-$12.50", ".")).toBe(-1250);
    expect(parseMoneyCents("$-12.50", ".")).toBe(-1250);
    expect(parseMoneyCents("($12.50)", ".")).toBe(-1250);
  });

  test("rounded half away from zero, in decimal, with no floating-point error", () => {
    // Recurra's rule (half away from zero); 0.1 + 0.2 would be 0.30000000000000004 in floats
    expect(parseMoneyCents("0.125", ".")).toBe(13);
    expect(parseMoneyCents("-0.125", ".")).toBe(-13);
    expect(parseMoneyCents("0.124999", ".")).toBe(12);
    expect(parseMoneyCents("1.005", ".")).toBe(101); // 1.005 * 100 is 100.49999… in floats
    expect(parseMoneyCents("0.3", ".")).toBe(30);
    expect(parseMoneyCents("19.99", ".")).toBe(1999);
    expect(Number.isInteger(parseMoneyCents("4.35", "."))).toBe(true);
    expect(parseMoneyCents("4.35", ".")).toBe(435); // 4.35 * 100 is 434.99999… in floats
  });

  test("refuses words, bad grouping and amounts beyond exact cents", () => {
    // Recurra's rule
    expect(parseMoneyCents("twelve", ".")).toBeNull();
    expect(parseMoneyCents("12,5", ".")).toBeNull();
    expect(parseMoneyCents("10000000000000", ".")).toBeNull();
    expect(parseMoneyCents("9999999999999", ".")).toBe(999999999999900);
    expect(parseMoneyCents("", ".")).toBeNull();
  });
});

describe("parseInteger and parseYear", () => {
  test("whole numbers with thousands separators; fractions refused", () => {
    // common practice
    expect(parseInteger("1,200", ".")).toBe(1200);
    expect(parseInteger("1.200", ",")).toBe(1200);
    expect(parseInteger("12.5", ".")).toBeNull();
    expect(parseInteger("12.0", ".")).toBe(12);
  });

  test("model years: four digits, or two digits with the pivot", () => {
    // Recurra's rule (TWO_DIGIT_YEAR_PIVOT = 80)
    expect(parseYear("2019")).toBe(2019);
    expect(parseYear("19")).toBe(2019);
    expect(parseYear("85")).toBe(1985);
    expect(parseYear("2019.0")).toBeNull();
    expect(parseYear("MY19")).toBeNull();
    expect(parseYear("201")).toBeNull();
  });
});

describe("parseBoolean", () => {
  test("yes/no words, letters, digits, x and ticks", () => {
    // common practice
    for (const yes of ["yes", "Y", "TRUE", "t", "1", "x", "X", "on", "✓"]) {
      expect(parseBoolean(yes), yes).toBe(true);
    }
    for (const no of ["no", "N", "False", "f", "0", "off"]) {
      expect(parseBoolean(no), no).toBe(false);
    }
  });

  test("blank is null (the row readers read it as no); anything else is null", () => {
    // Recurra's rule
    expect(parseBoolean("")).toBeNull();
    expect(parseBoolean("  ")).toBeNull();
    expect(parseBoolean("maybe")).toBeNull();
    expect(parseBoolean("2")).toBeNull();
  });
});

describe("units", () => {
  test("distance unit words", () => {
    // common practice
    expect(parseDistanceUnit("mi")).toBe("mi");
    expect(parseDistanceUnit("Miles")).toBe("mi");
    expect(parseDistanceUnit("KM")).toBe("km");
    expect(parseDistanceUnit("kilometres")).toBe("km");
    expect(parseDistanceUnit("kilometers")).toBe("km");
    expect(parseDistanceUnit("m")).toBeNull(); // metres or miles? refused
    expect(parseDistanceUnit("hours")).toBeNull();
  });

  test("volume unit words; a bare gallon is a US gallon", () => {
    // common practice; bare "gal" as US gallons is Recurra's rule
    expect(parseVolumeUnit("L")).toBe("l");
    expect(parseVolumeUnit("litre")).toBe("l");
    expect(parseVolumeUnit("Liters")).toBe("l");
    expect(parseVolumeUnit("gal")).toBe("us-gal");
    expect(parseVolumeUnit("US gal")).toBe("us-gal");
    expect(parseVolumeUnit("USG")).toBe("us-gal");
    expect(parseVolumeUnit("imp gal")).toBe("imp-gal");
    expect(parseVolumeUnit("Imperial gallons")).toBe("imp-gal");
    expect(parseVolumeUnit("kg")).toBeNull();
  });

  test("conversions use the exact NIST SP 811 factors", () => {
    // NIST SP 811: 1 mi = 1.609344 km exactly
    expect(toMiles(1.609344, "km")).toBe(1);
    expect(toMiles(160934.4, "km")).toBeCloseTo(100000, 9); // absolute tolerance 1e-9
    expect(toMiles(42, "mi")).toBe(42);
    // NIST SP 811: 1 US gal = 3.785411784 L exactly; 1 imp gal = 4.54609 L exactly
    expect(toLitres(1, "us-gal")).toBe(3.785411784);
    expect(toLitres(10, "us-gal")).toBeCloseTo(37.85411784, 12); // absolute tolerance 1e-12
    expect(toLitres(1, "imp-gal")).toBe(4.54609);
    expect(toLitres(40, "l")).toBe(40);
  });
});
