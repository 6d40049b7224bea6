import seedrandom from "seedrandom";
import { describe, expect, test } from "vitest";

import { isCleanValidVin } from "@/lib/import/vin-fast-path";
import { checkVin } from "@/lib/vin";

// Sources: "49 CFR 565" (check digit, allowed characters) through the worked example VINs of
// trade-facts.md; "lib/vin.ts" as the reference the quick path must agree with.

describe("isCleanValidVin", () => {
  test("accepts the worked examples; refuses each with one character changed", () => {
    // 49 CFR 565 worked examples (trade-facts.md)
    for (const vin of ["1M8GDM9AXKP042788", "1G4AH59H45G118341", "1J9RP1A36A1644345"]) {
      expect(isCleanValidVin(vin), vin).toBe(true);
      expect(isCleanValidVin(`${vin.slice(0, 16)}${vin[16] === "1" ? "2" : "1"}`), vin).toBe(false);
    }
  });

  test("leaves placeholders, lower case, spaces and I/O/Q to the full check", () => {
    // trade-facts.md: 11111111111111111 passes the check digit but is a placeholder
    expect(isCleanValidVin("11111111111111111")).toBe(false);
    expect(isCleanValidVin("1g4ah59h45g118341")).toBe(false);
    expect(isCleanValidVin(" 1G4AH59H45G118341")).toBe(false);
    expect(isCleanValidVin("1G4AH59H45G11834I")).toBe(false);
    expect(isCleanValidVin("1G4AH59H45G11834")).toBe(false);
    expect(isCleanValidVin("")).toBe(false);
  });

  test("agrees with checkVin on 20,000 random strings", () => {
    // lib/vin.ts is the reference: yes exactly when checkVin says well-formed, valid, not a
    // placeholder, and the VIN is already in normal form
    const rng = seedrandom("vin-fast-path");
    const chars = "0123456789ABCDEFGHJKLMNPRSTUVWXYZIOQa -";
    let accepted = 0;
    for (let n = 0; n < 20_000; n++) {
      const len = rng() < 0.9 ? 17 : Math.floor(rng() * 20);
      let vin = "";
      for (let i = 0; i < len; i++) {
        vin += chars[Math.floor(rng() * (rng() < 0.95 ? 33 : chars.length))];
      }
      const c = checkVin(vin);
      const expected = c.isWellFormed && c.hasValidCheckDigit && !c.isPlaceholder && c.vin === vin;
      expect(isCleanValidVin(vin), vin).toBe(expected);
      if (expected) accepted++;
    }
    expect(accepted).toBeGreaterThan(100); // the sample holds valid VINs too
  });
});
