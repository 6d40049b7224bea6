/**
 * Readers for single CSV cells: dates, timestamps, numbers, money, yes/no and units. They run
 * for every cell of every row, so they scan characters by hand and build no regular expression
 * per call. Each returns null for a blank cell and for a value it cannot read; none throws.
 */
import { DISTANCE_UNITS, type DistanceUnit } from "@/db/schema/organisations";
import { KM_PER_MILE, LITRES_PER_IMPERIAL_GALLON, LITRES_PER_US_GALLON } from "@/lib/units";

export { DISTANCE_UNITS, type DistanceUnit };

export const DATE_FORMATS = ["iso", "mdy", "dmy"] as const;
/** Order of day, month and year in dates that are not year-first. */
export type DateFormat = (typeof DATE_FORMATS)[number];

export const DECIMAL_SEPARATORS = [".", ","] as const;
export type DecimalSeparator = (typeof DECIMAL_SEPARATORS)[number];

export const VOLUME_UNITS = ["l", "us-gal", "imp-gal"] as const;
export type VolumeUnit = (typeof VOLUME_UNITS)[number];

/**
 * Two-digit years: 00–79 are 2000–2079 and 80–99 are 1980–1999 (Recurra's rule). Recurra holds
 * nothing before 1980 (the first model year of the 17-character VIN), so "85" can only be 1985,
 * and "24" is 2024.
 */
export const TWO_DIGIT_YEAR_PIVOT = 80;

export function expandTwoDigitYear(yy: number): number {
  return yy < TWO_DIGIT_YEAR_PIVOT ? 2000 + yy : 1900 + yy;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const;

/** Gregorian calendar rule. */
function isLeapYear(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

function daysInMonth(y: number, m: number): number {
  return m === 2 && isLeapYear(y) ? 29 : (DAYS_IN_MONTH[m - 1] as number);
}

const MONTH_NAMES: ReadonlyMap<string, number> = new Map(
  [
    ["jan", "january"],
    ["feb", "february"],
    ["mar", "march"],
    ["apr", "april"],
    ["may", "may"],
    ["jun", "june"],
    ["jul", "july"],
    ["aug", "august"],
    ["sep", "september", "sept"],
    ["oct", "october"],
    ["nov", "november"],
    ["dec", "december"],
  ].flatMap((names, i) => names.map((n): [string, number] => [n, i + 1])),
);

/** "00" … "99", so formatting a date builds no number strings. */
const TWO_DIGITS = Array.from({ length: 100 }, (_, n) => (n < 10 ? `0${n}` : String(n)));
const pad2 = (n: number): string => TWO_DIGITS[n] ?? String(n);

function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}

function isLetter(c: number): boolean {
  return (c >= 65 && c <= 90) || (c >= 97 && c <= 122);
}

/**
 * The value of the last readDigits call. Kept in a module variable, like the parsed date
 * below, so that reading a cell allocates nothing (JavaScript runs one reader at a time).
 */
let digitValue = 0;

/** Reads up to maxDigits digits from s at i into digitValue; returns the index after them. */
function readDigits(s: string, i: number, maxDigits: number): number {
  let v = 0;
  let j = i;
  while (j < s.length && j - i < maxDigits && isDigit(s.charCodeAt(j))) {
    v = v * 10 + s.charCodeAt(j) - 48;
    j++;
  }
  digitValue = v;
  return j;
}

/** The date read by the last successful readDate call. */
const date = { y: 0, m: 0, d: 0 };

/** Stores a real calendar date and returns `end`, or -1 for an impossible one. */
function checkedDate(y: number, m: number, d: number, end: number): number {
  if (y < 1000 || m < 1 || m > 12 || d < 1 || d > daysInMonth(y, m)) return -1;
  date.y = y;
  date.m = m;
  date.d = d;
  return end;
}

/**
 * Reads the date at the start of s (already trimmed) into `date` and returns the index after
 * it, or -1. Year-first dates (4-digit first part) and 8-digit YYYYMMDD are read as ISO whatever
 * the format; a month written as a word ("5 Mar 2024", "05-Mar-24") needs no format; other
 * dates follow `format`.
 */
function readDate(s: string, format: DateFormat): number {
  const lenA = readDigits(s, 0, 8);
  const a = digitValue;
  if (lenA === 0) return -1;
  if (lenA === 8) {
    return checkedDate(Math.floor(a / 10000), Math.floor(a / 100) % 100, a % 100, 8);
  }
  const sep = s.charCodeAt(lenA);
  // "-" "/" "." or a space before a month word.
  if (sep !== 45 && sep !== 47 && sep !== 46 && sep !== 32) return -1;
  let i = lenA + 1;
  let b: number;
  let isMonthWord = false;
  if (isLetter(s.charCodeAt(i))) {
    let j = i;
    while (j < s.length && isLetter(s.charCodeAt(j))) j++;
    const month = MONTH_NAMES.get(s.slice(i, j).toLowerCase());
    if (month === undefined) return -1;
    b = month;
    isMonthWord = true;
    i = j;
  } else {
    if (sep === 32) return -1;
    const end = readDigits(s, i, 2);
    if (end === i) return -1;
    b = digitValue;
    i = end;
  }
  if (s.charCodeAt(i) !== sep) return -1;
  const afterC = readDigits(s, i + 1, 4);
  const c = digitValue;
  const lenC = afterC - i - 1;
  if (lenC === 0) return -1;
  if (lenA === 4) {
    if (isMonthWord || lenC > 2) return -1;
    return checkedDate(a, b, c, afterC);
  }
  if (lenA > 2 || (lenC !== 2 && lenC !== 4)) return -1;
  const y = lenC === 2 ? expandTwoDigitYear(c) : c;
  if (isMonthWord) return checkedDate(y, b, a, afterC);
  if (format === "mdy") return checkedDate(y, a, b, afterC);
  if (format === "dmy") return checkedDate(y, b, a, afterC);
  return -1;
}

/**
 * The date at the start of a cell as the number YYYYMMDD, or -1; the rules of parseDate. For
 * callers that keep the formatted strings of the dates they have seen (a file holds a few
 * thousand dates over a million rows), so reading a date allocates nothing.
 */
export function parseDateNumber(raw: string, format: DateFormat): number {
  const s = raw.trim();
  const end = readDate(s, format);
  if (end < 0) return -1;
  if (end !== s.length) {
    // A time after the date (a space or "T" and a digit) is allowed and ignored.
    const next = s.charCodeAt(end);
    if ((next !== 32 && next !== 84 && next !== 116) || !isDigit(s.charCodeAt(end + 1))) return -1;
  }
  return date.y * 10000 + date.m * 100 + date.d;
}

/** YYYYMMDD (as from parseDateNumber) → "YYYY-MM-DD". */
export function formatDateNumber(n: number): string {
  const y = Math.floor(n / 10000);
  return `${y}-${pad2(Math.floor(n / 100) % 100)}-${pad2(n % 100)}`;
}

/**
 * A calendar date as YYYY-MM-DD, or null. Separators "-", "/" or "."; year-first dates are read
 * as ISO whatever `format` says; two-digit years follow TWO_DIGIT_YEAR_PIVOT; impossible dates
 * (31/02/2024, month 13, 29/02/2023) give null. A time after the date (a space or "T" and a
 * digit) is ignored, since spreadsheets often add "00:00" to plain dates.
 */
export function parseDate(raw: string, format: DateFormat): string | null {
  const n = parseDateNumber(raw, format);
  return n < 0 ? null : formatDateNumber(n);
}

/**
 * A date and time as an ISO 8601 string, or null. The time, after a space or "T", is
 * H:MM or H:MM:SS (fractions of a second dropped), optionally with AM/PM, then optionally a
 * zone: "Z", "UTC", "GMT" or an offset (+02:00, +0200, +02).
 *
 * Without a zone the wall time is kept as written, with no "Z": "2024-03-05T14:30:00" (fleet
 * exports rarely carry a zone, and the vehicle's local time is what the data means). With a
 * zone the instant is converted to UTC and written with "Z". A date alone is midnight:
 * "2024-03-05T00:00:00".
 */
export function parseTimestamp(raw: string, format: DateFormat): string | null {
  const s = raw.trim();
  const end = readDate(s, format);
  if (end < 0) return null;
  const { y, m, d } = date;
  const day = formatDateNumber(y * 10000 + m * 100 + d);
  if (end === s.length) return `${day}T00:00:00`;
  let i = end;
  const sep = s.charCodeAt(i);
  if (sep !== 32 && sep !== 84 && sep !== 116) return null;
  i++;
  while (s.charCodeAt(i) === 32) i++;
  const afterH = readDigits(s, i, 2);
  const h0 = digitValue;
  if (afterH === i || s.charCodeAt(afterH) !== 58) return null;
  const afterM = readDigits(s, afterH + 1, 2);
  const mi = digitValue;
  if (afterM - afterH - 1 !== 2) return null;
  let sec = 0;
  i = afterM;
  if (s.charCodeAt(i) === 58) {
    const afterS = readDigits(s, i + 1, 2);
    if (afterS - i - 1 !== 2) return null;
    sec = digitValue;
    i = afterS;
    if (s.charCodeAt(i) === 46 || s.charCodeAt(i) === 44) {
      const fracEnd = readDigits(s, i + 1, 9);
      if (fracEnd === i + 1) return null;
      i = fracEnd;
    }
  }
  let h = h0;
  const rest = s.slice(i).trim().toUpperCase();
  let zone = rest;
  const meridiem =
    rest.startsWith("AM") || rest.startsWith("A.M.")
      ? "AM"
      : rest.startsWith("PM") || rest.startsWith("P.M.")
        ? "PM"
        : null;
  if (meridiem) {
    if (h < 1 || h > 12) return null;
    h = (h % 12) + (meridiem === "PM" ? 12 : 0);
    zone = rest.slice(rest.startsWith(`${meridiem[0]}.`) ? 4 : 2).trim();
  }
  if (h > 23 || mi > 59 || sec > 59) return null;
  const wall = `${day}T${pad2(h)}:${pad2(mi)}:${pad2(sec)}`;
  if (zone === "") return wall;
  const offset = zoneOffsetMinutes(zone);
  if (offset === null) return null;
  const utc = Date.UTC(y, m - 1, d, h, mi, sec) - offset * 60_000;
  return `${new Date(utc).toISOString().slice(0, 19)}Z`;
}

/** "Z", "UTC", "GMT", "+02:00", "+0200", "+02", "-05:30" → minutes east of UTC; else null. */
function zoneOffsetMinutes(zone: string): number | null {
  if (zone === "Z" || zone === "UTC" || zone === "GMT") return 0;
  const sign = zone.charCodeAt(0) === 43 ? 1 : zone.charCodeAt(0) === 45 ? -1 : 0;
  if (sign === 0) return null;
  const afterH = readDigits(zone, 1, 2);
  const hh = digitValue;
  if (afterH !== 3 || hh > 14) return null;
  let i = afterH;
  if (zone.charCodeAt(i) === 58) i++;
  if (i === zone.length) return i === 3 ? sign * hh * 60 : null;
  const afterM = readDigits(zone, i, 2);
  const mm = digitValue;
  if (afterM - i !== 2 || afterM !== zone.length || mm > 59) return null;
  return sign * (hh * 60 + mm);
}

// ─── Numbers ──────────────────────────────────────────────────────────────────────────────

/**
 * What scanNumber read, kept in module variables rather than a fresh object per cell (the
 * readers run for millions of cells, and JavaScript runs one of them at a time). Digits are
 * accumulated as exact integers, never through strings.
 */
const scanned = {
  isNegative: false,
  /** All digits read, whole and fraction, as one integer (exact below 2^53). */
  mantissa: 0,
  /** Digits after the decimal separator. */
  fractionDigits: 0,
  /** Total digits read; beyond MAX_DIGITS the mantissa stops and parseDecimal reads the text. */
  digits: 0,
  /** The whole part, and the first two fraction digits as cents, for money. */
  whole: 0,
  cents: 0,
  /** The third fraction digit (0–9), which decides rounding to the cent. */
  thirdDigit: 0,
};

/** Digits the mantissa holds exactly: 15 keeps every integer below 2^53. */
const MAX_DIGITS = 15;
/** 10^k for k ≤ 22 is exact in a double, so mantissa / 10^k is correctly rounded. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);

function isGroupSpace(c: number): boolean {
  // space, no-break space, thin space, narrow no-break space, apostrophe, right single quote
  return c === 32 || c === 0xa0 || c === 0x2009 || c === 0x202f || c === 39 || c === 0x2019;
}

function isCurrencyChar(c: number): boolean {
  // $ € £ ¥ ₹ ₽ and letters (currency codes such as USD, EUR, or "kr"), and spaces between them
  return (
    c === 36 ||
    c === 0x20ac ||
    c === 0xa3 ||
    c === 0xa5 ||
    c === 0x20b9 ||
    c === 0x20bd ||
    isLetter(c) ||
    c === 32 ||
    c === 0xa0
  );
}

/**
 * Splits a written number into sign, whole digits and fraction digits. Thousands separators are
 * checked: groups after the first have exactly three digits, and one kind of separator is
 * used ("," or space or apostrophe for a "." decimal; "." or space or apostrophe for a ","
 * decimal). Negative: leading "-" (or U+2212) or parentheses.
 */
function isBlankChar(c: number): boolean {
  return c <= 32 || c === 0xa0;
}

/** First index from `start` whose character fails `skip` (module-level: no closure per call). */
function skipForward(raw: string, start: number, end: number, skip: (c: number) => boolean) {
  while (start < end && skip(raw.charCodeAt(start))) start++;
  return start;
}

function skipBack(raw: string, start: number, end: number, skip: (c: number) => boolean) {
  while (end > start && skip(raw.charCodeAt(end - 1))) end--;
  return end;
}

/**
 * Reads a written number into `scanned`; false when it is not one. Thousands separators are
 * checked: groups after the first have exactly three digits, and one kind of separator is used
 * ("," or space or apostrophe for a "." decimal; "." or space or apostrophe for a ","
 * decimal). Negative: leading "-" (or U+2212) or parentheses. With `isMoney`, currency symbols
 * and codes before or after the number are skipped.
 */
function scanNumber(raw: string, decimal: DecimalSeparator, isMoney: boolean): boolean {
  let start = 0;
  let end = raw.length;
  let isNegative = false;
  // Most cells are bare digits; only others need the trimming, sign and currency steps.
  if (end === 0 || !isDigit(raw.charCodeAt(0)) || !isDigit(raw.charCodeAt(end - 1))) {
    start = skipForward(raw, 0, end, isBlankChar);
    end = skipBack(raw, start, end, isBlankChar);
    if (start === end) return false;
    if (raw.charCodeAt(start) === 40 && raw.charCodeAt(end - 1) === 41) {
      isNegative = true;
      start = skipForward(raw, start + 1, end - 1, isBlankChar);
      end = skipBack(raw, start, end - 1, isBlankChar);
    }
    if (isMoney) {
      start = skipForward(raw, start, end, isCurrencyChar);
      end = skipBack(raw, start, end, isCurrencyChar);
    }
    const first = raw.charCodeAt(start);
    if (first === 45 || first === 0x2212 || first === 43) {
      if (first !== 43) {
        if (isNegative) return false;
        isNegative = true;
      }
      start = skipForward(raw, start + 1, end, isMoney ? isCurrencyChar : isBlankChar);
    }
  }
  const decimalCode = decimal === "." ? 46 : 44;
  const otherCode = decimal === "." ? 44 : 46;
  let group = -1; // the thousands separator in use, once seen
  let groupDigits = 0; // digits since the last separator
  let isFraction = false;
  let digits = 0;
  let mantissa = 0;
  let whole = 0;
  let fractionDigits = 0;
  let cents = 0;
  let thirdDigit = 0;
  for (let i = start; i < end; i++) {
    const c = raw.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      const d = c - 48;
      if (++digits <= MAX_DIGITS) mantissa = mantissa * 10 + d;
      if (!isFraction) {
        whole = whole * 10 + d;
        groupDigits++;
      } else {
        fractionDigits++;
        if (fractionDigits <= 2) cents = cents * 10 + d;
        else if (fractionDigits === 3) thirdDigit = d;
      }
      continue;
    }
    if (c === decimalCode && !isFraction) {
      if (group >= 0 && groupDigits !== 3) return false;
      isFraction = true;
      continue;
    }
    if (isFraction) return false;
    if (c === otherCode || isGroupSpace(c)) {
      if (group >= 0 ? c !== group || groupDigits !== 3 : groupDigits < 1 || groupDigits > 3) {
        return false;
      }
      group = c;
      groupDigits = 0;
      continue;
    }
    return false;
  }
  if (digits === 0) return false;
  if (!isFraction && group >= 0 && groupDigits !== 3) return false;
  if (fractionDigits === 1) cents *= 10;
  scanned.isNegative = isNegative;
  scanned.mantissa = mantissa;
  scanned.fractionDigits = fractionDigits;
  scanned.digits = digits;
  scanned.whole = whole;
  scanned.cents = cents;
  scanned.thirdDigit = thirdDigit;
  return true;
}

/**
 * A number written with `decimal` as its decimal separator, or null. "1.234,56" (",") and
 * "1,234.56" (".") are 1234.56; "12,5" is 12.5 with "," and null with "." (a comma followed by
 * one digit cannot be a thousands separator). Negatives "-3" and "(3)". No currency symbols:
 * use parseMoneyCents for amounts. Up to 15 digits the value is read as an exact integer and
 * divided once by a power of ten (correctly rounded in IEEE 754); longer ones go through Number.
 */
export function parseDecimal(raw: string, decimal: DecimalSeparator): number | null {
  if (!scanNumber(raw, decimal, false)) return null;
  const v =
    scanned.digits <= MAX_DIGITS
      ? scanned.mantissa / (POWERS_OF_TEN[scanned.fractionDigits] as number)
      : longNumber(raw, decimal);
  return scanned.isNegative && v !== 0 ? -v : v;
}

/**
 * The magnitude of a number with more digits than the mantissa holds (such as a spreadsheet's
 * "0.30000000000000004"), already checked by scanNumber: its digits and decimal point handed to
 * Number, which rounds correctly.
 */
function longNumber(raw: string, decimal: DecimalSeparator): number {
  const decimalCode = decimal === "." ? 46 : 44;
  let text = "";
  for (let i = 0; i < raw.length; i++) {
    const c = raw.charCodeAt(i);
    if (c >= 48 && c <= 57) text += raw[i];
    else if (c === decimalCode) text += ".";
  }
  return Number(text);
}

/**
 * An amount of money in integer cents, or null. Currency symbols and codes before or after the
 * number are ignored ("$1,234.56", "1.234,56 €", "USD 12"). Rounded to the cent half away from
 * zero, in decimal digits (never through a floating-point product): "0.125" → 13, "-0.125" →
 * -13. Null from 10^13 up (beyond exact cents).
 */
export function parseMoneyCents(raw: string, decimal: DecimalSeparator): number | null {
  if (!scanNumber(raw, decimal, true) || scanned.whole >= 1e13) return null;
  const cents = scanned.whole * 100 + scanned.cents + (scanned.thirdDigit >= 5 ? 1 : 0);
  return scanned.isNegative && cents !== 0 ? -cents : cents;
}

/** A whole number (thousands separators allowed), or null for fractions and words. */
export function parseInteger(raw: string, decimal: DecimalSeparator): number | null {
  const v = parseDecimal(raw, decimal);
  return v !== null && Number.isSafeInteger(v) ? v : null;
}

/** A model year: four digits, or two digits read with TWO_DIGIT_YEAR_PIVOT ("19" → 2019). */
export function parseYear(raw: string): number | null {
  const s = raw.trim();
  if (s.length !== 4 && s.length !== 2) return null;
  if (readDigits(s, 0, 4) !== s.length) return null;
  return s.length === 2 ? expandTwoDigitYear(digitValue) : digitValue;
}

// ─── Yes / no ─────────────────────────────────────────────────────────────────────────────

const BOOLEAN_WORDS: ReadonlyMap<string, boolean> = new Map([
  ...["yes", "y", "true", "t", "1", "x", "on", "✓", "✔", "checked"].map((w): [string, boolean] => [
    w,
    true,
  ]),
  ...["no", "n", "false", "f", "0", "off", "unchecked"].map((w): [string, boolean] => [w, false]),
]);

/**
 * yes/no, y/n, true/false, t/f, 1/0, on/off, x or a tick mark. A blank cell is null: where a
 * column uses the "x or blank" habit, the row readers read a blank as false.
 */
export function parseBoolean(raw: string): boolean | null {
  const s = raw.trim();
  if (s === "") return null;
  return BOOLEAN_WORDS.get(s.toLowerCase()) ?? null;
}

// ─── Units ────────────────────────────────────────────────────────────────────────────────

const DISTANCE_WORDS: ReadonlyMap<string, DistanceUnit> = new Map([
  ...["mi", "mile", "miles", "mls"].map((w): [string, DistanceUnit] => [w, "mi"]),
  ...["km", "kms", "kilometre", "kilometres", "kilometer", "kilometers"].map(
    (w): [string, DistanceUnit] => [w, "km"],
  ),
]);

const VOLUME_WORDS: ReadonlyMap<string, VolumeUnit> = new Map([
  ...["l", "lt", "ltr", "ltrs", "litre", "litres", "liter", "liters"].map(
    (w): [string, VolumeUnit] => [w, "l"],
  ),
  ...[
    "gal",
    "gals",
    "gallon",
    "gallons",
    "usgal",
    "usgals",
    "usg",
    "usgallon",
    "usgallons",
    "galus",
  ].map((w): [string, VolumeUnit] => [w, "us-gal"]),
  ...[
    "impgal",
    "impgals",
    "imperialgallon",
    "imperialgallons",
    "ukgal",
    "ukgallon",
    "ukgallons",
    "galimp",
    "galuk",
    "ig",
  ].map((w): [string, VolumeUnit] => [w, "imp-gal"]),
]);

const UNIT_NOISE = /[\s.\-_()]/g;

function unitWord(raw: string): string {
  return raw.toLowerCase().replace(UNIT_NOISE, "");
}

/** "mi", "miles", "km", "kilometres", "kilometers" (any case) → "mi" | "km"; else null. */
export function parseDistanceUnit(raw: string): DistanceUnit | null {
  return DISTANCE_WORDS.get(unitWord(raw)) ?? null;
}

/**
 * Litres ("L", "ltr", "litre", "liter"), US gallons ("US gal", "USG") or imperial gallons ("imp
 * gal", "UK gal"). A bare "gal" or "gallons" is read as US gallons (Recurra's rule: the
 * product's default units are US; imperial must be said).
 */
export function parseVolumeUnit(raw: string): VolumeUnit | null {
  return VOLUME_WORDS.get(unitWord(raw)) ?? null;
}

/** A distance in miles; 1 mi = 1.609344 km exactly (NIST SP 811). */
export function toMiles(value: number, unit: DistanceUnit): number {
  return unit === "km" ? value / KM_PER_MILE : value;
}

/** A volume in litres; 1 US gal = 3.785411784 L, 1 imp gal = 4.54609 L exactly (NIST SP 811). */
export function toLitres(value: number, unit: VolumeUnit): number {
  if (unit === "us-gal") return value * LITRES_PER_US_GALLON;
  if (unit === "imp-gal") return value * LITRES_PER_IMPERIAL_GALLON;
  return value;
}
