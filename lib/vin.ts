/**
 * Vehicle identification numbers: ISO 3779 structure and the US check digit and model-year
 * rules of 49 CFR Part 565 (§565.15, tables I–V; model-year position 7 rule added by the 2008
 * amendment, 73 FR 23367).
 */

/** Transliteration of letters to values, 49 CFR 565.15 table IV. I, O and Q never appear. */
// prettier-ignore
const LETTER_VALUES: Readonly<Record<string, number>> = {
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8,
  J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
};

/** Position weights, 49 CFR 565.15 table V (position 9, the check digit itself, weighs 0). */
const WEIGHTS = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2] as const;

/** Model-year codes for position 10 in the first 30-year cycle (1980–2009), §565.15 table VI. */
const YEAR_CODES = "ABCDEFGHJKLMNPRSTVWXY123456789";

const VIN_PATTERN = /^[A-HJ-NPR-Z0-9]{17}$/;

export function normaliseVin(raw: string): string {
  return raw.trim().toUpperCase().replace(/[\s-]/g, "");
}

function transliterate(ch: string): number {
  if (ch >= "0" && ch <= "9") return ch.charCodeAt(0) - 48;
  const v = LETTER_VALUES[ch];
  if (v === undefined) throw new Error(`vin: character ${JSON.stringify(ch)} is not allowed`);
  return v;
}

/**
 * The weighted sum of 49 CFR 565.15 (position 9 weighs zero). Normalises like vinCheckDigit and
 * throws on a VIN that is not 17 allowed characters, rather than summing only part of it.
 */
export function vinWeightedSum(vin: string): number {
  const v = normaliseVin(vin);
  if (!VIN_PATTERN.test(v)) {
    throw new Error("vinWeightedSum: a VIN has 17 characters from 0-9 and A-Z without I, O, Q");
  }
  let sum = 0;
  for (let i = 0; i < 17; i++) sum += transliterate(v[i] as string) * (WEIGHTS[i] as number);
  return sum;
}

/**
 * The check digit a 17-character VIN must carry in position 9: weighted sum mod 11, with a
 * remainder of 10 written "X". Throws on a VIN that is not 17 allowed characters.
 */
export function vinCheckDigit(vin: string): string {
  const v = normaliseVin(vin);
  if (!VIN_PATTERN.test(v)) {
    throw new Error("vinCheckDigit: a VIN has 17 characters from 0-9 and A-Z without I, O, Q");
  }
  const r = vinWeightedSum(v) % 11;
  return r === 10 ? "X" : String(r);
}

/** Returns the VIN with position 9 replaced by the correct check digit. */
export function withVinCheckDigit(vin: string): string {
  const v = normaliseVin(vin);
  return `${v.slice(0, 8)}${vinCheckDigit(v)}${v.slice(9)}`;
}

export type VinCheck = {
  vin: string;
  /** false when the VIN is not 17 allowed characters: it cannot be used at all. */
  isWellFormed: boolean;
  /** Only meaningful for well-formed VINs; outside North America a wrong digit is a warning. */
  hasValidCheckDigit: boolean;
  isPlaceholder: boolean;
  problems: string[];
  wmi?: string;
  vds?: string;
  vis?: string;
  /** Candidate model years from position 10 (two 30-year cycles), newest last. */
  modelYears?: number[];
  /** Single model year when position 7 settles the cycle (light vehicles, 73 FR 23367). */
  modelYear?: number;
};

/** Model years that position 10 can mean, in both 30-year cycles. */
export function vinModelYearCandidates(code: string): number[] {
  const i = YEAR_CODES.indexOf(code.toUpperCase());
  if (i < 0 || code.length !== 1) return [];
  return [1980 + i, 2010 + i];
}

/**
 * Decodes and checks a VIN. For light vehicles (GVWR ≤ 10,000 lb) a numeric position 7 means the
 * 1980–2009 cycle and a letter the 2010–2039 cycle; pass isLightVehicle = false to get both
 * candidates without choosing.
 */
export function checkVin(raw: string, opts: { isLightVehicle?: boolean } = {}): VinCheck {
  const vin = normaliseVin(raw);
  const problems: string[] = [];
  if (vin.length !== 17) {
    problems.push(`A VIN has 17 characters; this one has ${vin.length}.`);
  }
  if (/[IOQ]/.test(vin)) problems.push("I, O and Q never appear in a VIN.");
  if (/[^A-Z0-9]/.test(vin)) problems.push("Only letters and digits appear in a VIN.");
  const isWellFormed = VIN_PATTERN.test(vin);
  if (!isWellFormed) {
    return { vin, isWellFormed, hasValidCheckDigit: false, isPlaceholder: false, problems };
  }
  const expected = vinCheckDigit(vin);
  const hasValidCheckDigit = vin[8] === expected;
  if (!hasValidCheckDigit) {
    problems.push(`Check digit is ${vin[8]}, expected ${expected} (49 CFR 565).`);
  }
  const isPlaceholder = /^(.)\1{16}$/.test(vin) || vin === "12345678901234567";
  if (isPlaceholder) problems.push("This looks like a placeholder, not a real VIN.");
  const yearCode = vin[9] as string;
  const modelYears = vinModelYearCandidates(yearCode);
  if (modelYears.length === 0) problems.push(`Position 10 (${yearCode}) is not a model-year code.`);
  let modelYear: number | undefined;
  if (modelYears.length === 2 && opts.isLightVehicle !== false) {
    const p7 = vin[6] as string;
    modelYear = /[0-9]/.test(p7) ? modelYears[0] : modelYears[1];
  }
  return {
    vin,
    isWellFormed,
    hasValidCheckDigit,
    isPlaceholder,
    problems,
    wmi: vin.slice(0, 3),
    vds: vin.slice(3, 9),
    vis: vin.slice(9),
    modelYears,
    modelYear,
  };
}

/** Position-10 code for a model year (1980–2039). */
export function vinYearCode(year: number): string {
  if (!Number.isInteger(year) || year < 1980 || year > 2039) {
    throw new Error("vinYearCode: model year must be an integer from 1980 to 2039");
  }
  return YEAR_CODES[(year - 1980) % 30] as string;
}
