import { describe, expect, it } from "vitest";
import { z } from "zod";
import { formNumber, parseFormNumber } from "@/lib/form-number";

describe("parseFormNumber", () => {
  it("reads thousands grouped by commas or spaces", () => {
    expect(parseFormNumber("25,000")).toBe(25_000);
    expect(parseFormNumber(" 1,250,000 ")).toBe(1_250_000);
    expect(parseFormNumber("25 000")).toBe(25_000);
    expect(parseFormNumber("25\u00a0000")).toBe(25_000);
    expect(parseFormNumber("25\u202f000.5")).toBe(25_000.5);
    expect(parseFormNumber("40000")).toBe(40_000);
    expect(parseFormNumber("0.95")).toBe(0.95);
    expect(parseFormNumber("-12")).toBe(-12);
  });

  it("refuses what it could misread", () => {
    expect(parseFormNumber("1,5")).toBeNull(); // a decimal comma, or a typo
    expect(parseFormNumber("25,00")).toBeNull();
    expect(parseFormNumber("2,5000")).toBeNull();
    expect(parseFormNumber("25,000 000")).toBeNull(); // two kinds of grouping
    expect(parseFormNumber("")).toBeNull();
    expect(parseFormNumber("   ")).toBeNull();
    expect(parseFormNumber("25k")).toBeNull();
    expect(parseFormNumber("0x10")).toBeNull();
    expect(parseFormNumber("Infinity")).toBeNull();
  });
});

describe("formNumber", () => {
  const band = formNumber("Give a band width.").pipe(z.number().int().min(1000, "At least 1,000."));

  it("takes what parseFormNumber reads", () => {
    expect(band.parse("25,000")).toBe(25_000);
    expect(band.parse(" 40000 ")).toBe(40_000);
  });

  it("says what is wrong instead of reading 0 or NaN", () => {
    const message = (v: unknown) => band.safeParse(v).error?.issues[0]?.message;
    expect(message("")).toBe("Give a band width.");
    expect(message("1,5")).toBe("Enter a number, like 25,000.");
    expect(message("lots")).toBe("Enter a number, like 25,000.");
    expect(message("500")).toBe("At least 1,000.");
  });
});
