import seedrandom from "seedrandom";
import { describe, expect, test } from "vitest";

import {
  checkVin,
  normaliseVin,
  vinCheckDigit,
  vinModelYearCandidates,
  vinWeightedSum,
  vinYearCode,
  withVinCheckDigit,
} from "@/lib/vin";

// Sources, as labelled beside each expected value:
// - "49 CFR 565.15": the regulation's own sample VIN, quoted in trade-facts.md ("VIN").
// - "trade-facts.md, worked example": the other worked VINs listed there.
// - "hand computation": sums worked by hand from tables IV–V as printed in trade-facts.md.
// - "73 FR 23367": the position-7 model-year rule, as stated in trade-facts.md.
// - "Recurra's rule": a choice made in lib/vin.ts, not a standard.

/** Every character a VIN may carry (49 CFR 565.4 via trade-facts.md: no I, O, Q). */
const ALLOWED = "0123456789ABCDEFGHJKLMNPRSTUVWXYZ";

/**
 * Reference transliteration, typed in from trade-facts.md (49 CFR 565 table IV) independently
 * of lib/vin.ts, so the module's table is checked rather than reused.
 */
// prettier-ignore
const REF_VALUE: Readonly<Record<string, number>> = {
  "0": 0, "1": 1, "2": 2, "3": 3, "4": 4, "5": 5, "6": 6, "7": 7, "8": 8, "9": 9,
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8,
  J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
};
/** Reference weights, trade-facts.md (49 CFR 565 table V). */
const REF_WEIGHTS = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2];

function refValue(ch: string): number {
  const v = REF_VALUE[ch];
  if (v === undefined) throw new Error(`test: no reference value for ${ch}`);
  return v;
}

function refSum(vin: string): number {
  let s = 0;
  for (let i = 0; i < 17; i++) s += refValue(vin[i] as string) * (REF_WEIGHTS[i] as number);
  return s;
}

function replaceAt(vin: string, index: number, ch: string): string {
  return `${vin.slice(0, index)}${ch}${vin.slice(index + 1)}`;
}

/**
 * A synthetic VIN with the given position-7 and position-10 characters and a correct check
 * digit. "1RC" is a made-up manufacturer identifier for tests only.
 */
function buildVin(p7: string, p10: string): string {
  return withVinCheckDigit(`1RCDE2${p7}F0${p10}K123456`);
}

describe("check digit, worked examples", () => {
  test("1M8GDM9AXKP042788: weighted sum 351, check X", () => {
    // trade-facts.md, worked example (sum 351, remainder 10 written X).
    expect(vinWeightedSum("1M8GDM9AXKP042788")).toBe(351);
    expect(vinCheckDigit("1M8GDM9AXKP042788")).toBe("X");
    const r = checkVin("1M8GDM9AXKP042788");
    expect(r.isWellFormed).toBe(true);
    expect(r.hasValidCheckDigit).toBe(true);
    expect(r.isPlaceholder).toBe(false);
    expect(r.problems).toEqual([]);
  });

  test("1G4AH59H45G118341: check 4, the regulation's own sample", () => {
    // 49 CFR 565.15 sample, via trade-facts.md; sum 411 (411 = 37·11 + 4) by hand computation.
    expect(vinWeightedSum("1G4AH59H45G118341")).toBe(411);
    expect(vinCheckDigit("1G4AH59H45G118341")).toBe("4");
    expect(checkVin("1G4AH59H45G118341").hasValidCheckDigit).toBe(true);
  });

  test("1J9RP1A36A1644345: check 6", () => {
    // trade-facts.md, worked example; sum 314 (314 = 28·11 + 6) by hand computation.
    expect(vinWeightedSum("1J9RP1A36A1644345")).toBe(314);
    expect(vinCheckDigit("1J9RP1A36A1644345")).toBe("6");
    expect(checkVin("1J9RP1A36A1644345").hasValidCheckDigit).toBe(true);
  });

  test("withVinCheckDigit restores the worked examples from a blanked position 9", () => {
    // trade-facts.md worked examples / 49 CFR 565.15 sample: position 9 is X, 4, 6.
    expect(withVinCheckDigit("1M8GDM9A0KP042788")).toBe("1M8GDM9AXKP042788");
    expect(withVinCheckDigit("1G4AH59H05G118341")).toBe("1G4AH59H45G118341");
    expect(withVinCheckDigit("1J9RP1A30A1644345")).toBe("1J9RP1A36A1644345");
  });

  test("check digit and weighted sum ignore what position 9 holds (weight 0)", () => {
    // trade-facts.md: position 9 weighs 0 in table V.
    expect(vinWeightedSum("1M8GDM9A7KP042788")).toBe(351);
    expect(vinCheckDigit("1G4AH59HZ5G118341")).toBe("4");
  });
});

describe("well-formedness", () => {
  test("I, O and Q are rejected", () => {
    // 49 CFR 565.4 via trade-facts.md: I, O and Q never appear.
    for (const bad of ["I", "O", "Q"]) {
      const vin = replaceAt("1M8GDM9AXKP042788", 11, bad);
      const r = checkVin(vin);
      expect(r.isWellFormed).toBe(false);
      expect(r.hasValidCheckDigit).toBe(false);
      expect(r.problems).toContain("I, O and Q never appear in a VIN.");
      expect(r.wmi).toBeUndefined();
      expect(() => vinCheckDigit(vin)).toThrow(/vinCheckDigit/);
    }
  });

  test("lower-case i, o and q are rejected too (normalised to upper case first)", () => {
    // 49 CFR 565.4 via trade-facts.md.
    expect(checkVin("1m8gdm9axkp04278o").isWellFormed).toBe(false);
    expect(checkVin("1m8gdm9axkp04278o").problems).toContain("I, O and Q never appear in a VIN.");
  });

  test("length errors name the actual length", () => {
    // trade-facts.md: 17 characters.
    const short = checkVin("1M8GDM9AXKP04278");
    expect(short.isWellFormed).toBe(false);
    expect(short.problems).toEqual(["A VIN has 17 characters; this one has 16."]);
    const long = checkVin("1M8GDM9AXKP0427888");
    expect(long.isWellFormed).toBe(false);
    expect(long.problems).toEqual(["A VIN has 17 characters; this one has 18."]);
    expect(checkVin("").problems).toEqual(["A VIN has 17 characters; this one has 0."]);
    expect(() => vinCheckDigit("1M8GDM9AXKP04278")).toThrow(/vinCheckDigit/);
  });

  test("punctuation other than spaces and dashes is not a VIN character", () => {
    // trade-facts.md: digits and letters only.
    const r = checkVin("1M8GDM9AXKP04278.");
    expect(r.isWellFormed).toBe(false);
    expect(r.problems).toContain("Only letters and digits appear in a VIN.");
  });

  test("lower case, spaces and dashes are normalised", () => {
    // Recurra's rule: people type VINs in groups and in lower case; the worked example
    // (trade-facts.md) must survive that.
    expect(normaliseVin(" 1m8gdm9axk-p04 2788\t")).toBe("1M8GDM9AXKP042788");
    const r = checkVin("1m8-gdm-9ax kp0 42788");
    expect(r.vin).toBe("1M8GDM9AXKP042788");
    expect(r.isWellFormed).toBe(true);
    expect(r.hasValidCheckDigit).toBe(true);
    expect(vinCheckDigit("1g4ah59h45g118341")).toBe("4");
  });

  test("WMI, VDS and VIS split at positions 1–3, 4–9, 10–17", () => {
    // trade-facts.md (ISO 3779 structure).
    const r = checkVin("1G4AH59H45G118341");
    expect([r.wmi, r.vds, r.vis]).toEqual(["1G4", "AH59H4", "5G118341"]);
  });

  test("vinWeightedSum refuses input that is not a 17-character VIN", () => {
    // Conventions: throw on impossible input with a message naming the function.
    expect(() => vinWeightedSum("1M8GDM9AXKP04278")).toThrow(/vinWeightedSum/);
    expect(() => vinWeightedSum("1M8GDM9AXKP0427888")).toThrow(/vinWeightedSum/);
    expect(() => vinWeightedSum("1M8GDM9AXKP0427O8")).toThrow(/vinWeightedSum/);
    // Same normalisation as vinCheckDigit: the worked example in lower case still sums to 351.
    expect(vinWeightedSum("1m8gdm9axkp042788")).toBe(351);
  });
});

describe("warnings that do not reject", () => {
  test("the all-ones placeholder passes the check digit but is flagged", () => {
    // trade-facts.md: 11111111111111111 passes the check digit but is a placeholder.
    // Hand computation: sum of the weights is 89 = 8·11 + 1, so the check digit is 1.
    expect(vinWeightedSum("11111111111111111")).toBe(89);
    const r = checkVin("11111111111111111");
    expect(r.isWellFormed).toBe(true);
    expect(r.hasValidCheckDigit).toBe(true);
    expect(r.isPlaceholder).toBe(true);
    expect(r.problems).toEqual(["This looks like a placeholder, not a real VIN."]);
  });

  test("12345678901234567 is flagged as a placeholder as well", () => {
    // Recurra's rule. Hand computation: sum 304 = 27·11 + 7, so its check digit 9 is wrong too.
    const r = checkVin("12345678901234567");
    expect(r.isPlaceholder).toBe(true);
    expect(r.hasValidCheckDigit).toBe(false);
  });

  test("a real-looking VIN is not a placeholder", () => {
    // trade-facts.md worked example.
    expect(checkVin("1J9RP1A36A1644345").isPlaceholder).toBe(false);
  });

  test("a wrong check digit is a problem message, not a rejection", () => {
    // trade-facts.md: outside North America a wrong check digit is a warning.
    const r = checkVin("1M8GDM9A0KP042788");
    expect(r.isWellFormed).toBe(true);
    expect(r.hasValidCheckDigit).toBe(false);
    expect(r.problems).toEqual(["Check digit is 0, expected X (49 CFR 565)."]);
    // Decoding still happens: the VIN stays usable.
    expect(r.wmi).toBe("1M8");
    expect(r.modelYears).toEqual([1989, 2019]);
  });
});

describe("model year", () => {
  // trade-facts.md: A–H 1980–87/2010–17, J–N 1988–92/2018–22, P 1993/2023, R–T 1994–96/2024–26,
  // V–Y 1997–2000/2027–30, 1–9 2001–09/2031–39.
  // prettier-ignore
  const table: [string, number][] = [
    ["A", 1980], ["B", 1981], ["C", 1982], ["D", 1983], ["E", 1984], ["F", 1985], ["G", 1986],
    ["H", 1987], ["J", 1988], ["K", 1989], ["L", 1990], ["M", 1991], ["N", 1992], ["P", 1993],
    ["R", 1994], ["S", 1995], ["T", 1996], ["V", 1997], ["W", 1998], ["X", 1999], ["Y", 2000],
    ["1", 2001], ["2", 2002], ["3", 2003], ["4", 2004], ["5", 2005], ["6", 2006], ["7", 2007],
    ["8", 2008], ["9", 2009],
  ];

  test.each(table)("position 10 %s means %i or 30 years later", (code, first) => {
    // 49 CFR 565.15 via trade-facts.md.
    expect(vinModelYearCandidates(code)).toEqual([first, first + 30]);
    expect(vinModelYearCandidates(code.toLowerCase())).toEqual([first, first + 30]);
    expect(vinYearCode(first)).toBe(code);
    expect(vinYearCode(first + 30)).toBe(code);
  });

  test("I O Q U Z 0 are never model-year codes", () => {
    // trade-facts.md.
    for (const c of ["I", "O", "Q", "U", "Z", "0"]) expect(vinModelYearCandidates(c)).toEqual([]);
    // Strings that are not one character are not codes, even if they occur in the code table.
    expect(vinModelYearCandidates("")).toEqual([]);
    expect(vinModelYearCandidates("AB")).toEqual([]);
  });

  test("U, Z and 0 in position 10 are a problem but the VIN stays well-formed", () => {
    // trade-facts.md: U, Z, 0 are legal VIN characters but not model-year codes.
    for (const c of ["U", "Z", "0"]) {
      const r = checkVin(buildVin("9", c));
      expect(r.isWellFormed).toBe(true);
      expect(r.hasValidCheckDigit).toBe(true);
      expect(r.modelYears).toEqual([]);
      expect(r.modelYear).toBeUndefined();
      expect(r.problems).toEqual([`Position 10 (${c}) is not a model-year code.`]);
    }
  });

  test("position 7 numeric picks 1980–2009, a letter picks 2010–2039", () => {
    // 73 FR 23367 via trade-facts.md; years from the position-10 table above.
    const cases: [string, string, number][] = [
      ["5", "A", 1980],
      ["B", "A", 2010],
      ["0", "Y", 2000],
      ["Z", "Y", 2030],
      ["3", "P", 1993],
      ["P", "P", 2023],
      ["9", "1", 2001],
      ["A", "1", 2031],
      ["1", "9", 2009],
      ["X", "9", 2039],
      ["7", "N", 1992],
      ["N", "N", 2022],
    ];
    for (const [p7, p10, year] of cases) {
      const vin = buildVin(p7, p10);
      const r = checkVin(vin);
      expect(r.hasValidCheckDigit, vin).toBe(true);
      expect(r.modelYear, vin).toBe(year);
      expect(checkVin(vin, { isLightVehicle: true }).modelYear, vin).toBe(year);
    }
  });

  test("the worked examples decode to their model years", () => {
    // Position 10 K with numeric position 7 → 1989; 5 with numeric 7 → 2005; A with letter 7
    // → 2010 (73 FR 23367 and the position-10 table, trade-facts.md).
    expect(checkVin("1M8GDM9AXKP042788").modelYear).toBe(1989);
    expect(checkVin("1G4AH59H45G118341").modelYear).toBe(2005);
    expect(checkVin("1J9RP1A36A1644345").modelYear).toBe(2010);
  });

  test("heavy vehicles get both candidates and no single year", () => {
    // 73 FR 23367 applies to light vehicles only (≤10,000 lb GVWR), trade-facts.md.
    const r = checkVin(buildVin("B", "A"), { isLightVehicle: false });
    expect(r.modelYears).toEqual([1980, 2010]);
    expect(r.modelYear).toBeUndefined();
  });

  test("vinYearCode round-trips every model year 1980–2039 through position 7", () => {
    // 49 CFR 565.15 table and 73 FR 23367 via trade-facts.md.
    for (let year = 1980; year <= 2039; year++) {
      const code = vinYearCode(year);
      const candidates = vinModelYearCandidates(code);
      expect(candidates, String(year)).toEqual(year < 2010 ? [year, year + 30] : [year - 30, year]);
      const vin = buildVin(year < 2010 ? "4" : "D", code);
      expect(checkVin(vin).modelYear, String(year)).toBe(year);
    }
  });

  test("the 30 codes are distinct within a cycle", () => {
    // trade-facts.md: each code means one year per 30-year cycle.
    const codes = new Set<string>();
    for (let year = 1980; year <= 2009; year++) codes.add(vinYearCode(year));
    expect(codes.size).toBe(30);
  });

  test("vinYearCode throws outside 1980–2039 and on non-integers", () => {
    // trade-facts.md: the two cycles cover 1980–2039.
    for (const bad of [1979, 2040, 2000.5, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => vinYearCode(bad), String(bad)).toThrow(/vinYearCode/);
    }
  });
});

describe("check digit properties over generated VINs", () => {
  const rng = seedrandom("recurra-vin-tests");
  const generated: string[] = [];
  for (let n = 0; n < 300; n++) {
    let raw = "";
    for (let i = 0; i < 17; i++) raw += ALLOWED[Math.floor(rng() * ALLOWED.length)];
    generated.push(withVinCheckDigit(raw));
  }

  test("withVinCheckDigit always yields a valid check digit, matching a reference sum", () => {
    // Reference: sum mod 11 from tables IV–V typed into this test (trade-facts.md).
    for (const vin of generated) {
      expect(checkVin(vin).hasValidCheckDigit, vin).toBe(true);
      const r = refSum(vin) % 11;
      expect(vin[8], vin).toBe(r === 10 ? "X" : String(r));
      expect(vinWeightedSum(vin), vin).toBe(refSum(vin));
    }
  });

  test("a single substitution passes exactly when it keeps the transliterated value outside position 9", () => {
    // Why: every weight outside position 9 is 1..10 and 11 is prime, so w·Δ ≡ 0 (mod 11) only
    // when Δ = 0, and Δ (a difference of two values 0..9) lies in −9..9. So a substitution in a
    // weighted position changes the remainder iff it changes the transliterated value. In
    // position 9 the expected digit is unchanged (weight 0) but the character is not, so every
    // substitution there is caught.
    let tried = 0;
    let undetected = 0;
    for (const vin of generated) {
      for (let pos = 0; pos < 17; pos++) {
        const old = vin[pos] as string;
        for (const ch of ALLOWED) {
          if (ch === old) continue;
          const passes = checkVin(replaceAt(vin, pos, ch)).hasValidCheckDigit;
          const expected = pos !== 8 && refValue(ch) === refValue(old);
          if (passes !== expected) {
            throw new Error(`${vin}: position ${pos + 1} ${old}→${ch} gave ${passes}`);
          }
          tried++;
          if (passes) undetected++;
        }
      }
    }
    expect(tried).toBe(300 * 17 * 32);
    // "Most cases": the undetected share is well under a tenth (exact count in the next test).
    expect(undetected / tried).toBeLessThan(0.1);
    expect(undetected).toBeGreaterThan(0);
  });

  test("exhaustively, 84 of the 1056 ordered character pairs go undetected in each weighted position", () => {
    // Hand computation from table IV (trade-facts.md): characters per value are
    // 0:{0} 1:{1,A,J} 2:{2,B,K,S} 3:{3,C,L,T} 4:{4,D,M,U} 5:{5,E,N,V} 6:{6,F,W} 7:{7,G,P,X}
    // 8:{8,H,Y} 9:{9,R,Z}, sizes 1,3,4,4,4,4,3,4,3,3 (33 characters). Ordered same-value pairs:
    // Σ n(n−1) = 0+6+12+12+12+12+6+12+6+6 = 84, out of 33·32 = 1056 ordered pairs.
    const base = "1RCDE2AF0PK123456";
    for (let pos = 0; pos < 17; pos++) {
      let undetected = 0;
      for (const from of ALLOWED) {
        const vin = withVinCheckDigit(replaceAt(base, pos, from));
        if (pos === 8 && vin[8] !== from) continue; // position 9 holds the digit it was given
        for (const to of ALLOWED) {
          if (to === from) continue;
          if (checkVin(replaceAt(vin, pos, to)).hasValidCheckDigit) undetected++;
        }
      }
      expect(undetected, `position ${pos + 1}`).toBe(pos === 8 ? 0 : 84);
    }
  });
});
