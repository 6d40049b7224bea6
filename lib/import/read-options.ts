/**
 * How to read a file's dates, numbers and units, worked out from its headers and a sample of
 * its rows, with the reasons in words so the user can confirm or change them.
 */
import type { ImportKind } from "@/db/schema/operations";
import { IMPORT_COLUMNS, type ColumnType } from "./columns";
import {
  describeDateOrder,
  detectDateOrder,
  needsDateOrder,
  type DateCell,
  type DateOrder,
} from "./date-order";
import type { ColumnMapping } from "./mapping";
import { normaliseHeader } from "./mapping";
import {
  parseDistanceUnit,
  parseVolumeUnit,
  type DateFormat,
  type DecimalSeparator,
  type DistanceUnit,
  type VolumeUnit,
} from "./values";

export type ReadOptions = {
  dateFormat: DateFormat;
  decimalSeparator: DecimalSeparator;
  /** Unit of odometer readings where the row does not say. */
  distanceUnit: DistanceUnit;
  /** Unit of fuel volumes where the row does not say. */
  volumeUnit: VolumeUnit;
};

export type DetectedReadOptions = {
  options: ReadOptions;
  reasons: string[];
  /** Whether the file decides the order of its dates, or the user must (date-order.ts). */
  dateOrder: DateOrder;
  isAmbiguous: { dateFormat: boolean; decimalSeparator: boolean };
};

/** Used where a file gives no clue and the caller passes no organisation default. */
export const DEFAULT_READ_OPTIONS: ReadOptions = {
  dateFormat: "mdy",
  decimalSeparator: ".",
  distanceUnit: "mi",
  volumeUnit: "us-gal",
};

const NUMERIC_TYPES: ReadonlySet<ColumnType> = new Set([
  "integer",
  "decimal",
  "money",
  "distance",
  "volume",
]);

/** The sample cells of the mapped columns whose type passes `accept`. */
function sampleCells(
  kind: ImportKind,
  mapping: ColumnMapping,
  rows: readonly (readonly string[])[],
  accept: (t: ColumnType) => boolean,
): string[] {
  const cells: string[] = [];
  for (const spec of IMPORT_COLUMNS[kind]) {
    const at = mapping[spec.key];
    if (typeof at !== "number" || !accept(spec.type)) continue;
    for (const row of rows) {
      const cell = row[at]?.trim();
      if (cell) cells.push(cell);
    }
  }
  return cells;
}

/** The sample cells of the mapped date and timestamp columns, with their headers. */
function dateCells(
  kind: ImportKind,
  headers: readonly string[],
  mapping: ColumnMapping,
  rows: readonly (readonly string[])[],
): DateCell[] {
  const cells: DateCell[] = [];
  for (const spec of IMPORT_COLUMNS[kind]) {
    const at = mapping[spec.key];
    if (typeof at !== "number" || (spec.type !== "date" && spec.type !== "timestamp")) continue;
    const column = headers[at] ?? spec.key;
    for (const row of rows) {
      const value = row[at]?.trim();
      if (value) cells.push({ column, value });
    }
  }
  return cells;
}

type DecimalEvidence = "dot" | "comma" | "undecided";

/** What one number cell says about the decimal separator. */
function decimalEvidence(cell: string): DecimalEvidence | null {
  const s = cell.replace(/[^\d.,]/g, "");
  const lastDot = s.lastIndexOf(".");
  const lastComma = s.lastIndexOf(",");
  if (lastDot < 0 && lastComma < 0) return null;
  if (lastDot >= 0 && lastComma >= 0) return lastDot > lastComma ? "dot" : "comma";
  const mark = lastDot >= 0 ? "." : ",";
  const at = Math.max(lastDot, lastComma);
  if (s.indexOf(mark) !== at) return mark === "." ? "comma" : "dot"; // repeated: a thousands mark
  const digitsAfter = s.length - at - 1;
  if (digitsAfter === 3) return "undecided"; // 1,234 or 1.234
  return mark === "." ? "dot" : "comma";
}

function detectDecimalSeparator(
  cells: readonly string[],
  fallback: DecimalSeparator,
): { separator: DecimalSeparator; reason: string; isAmbiguous: boolean } {
  const seen: Record<DecimalEvidence, number> = { dot: 0, comma: 0, undecided: 0 };
  let example = "";
  for (const cell of cells) {
    const e = decimalEvidence(cell);
    if (e === null) continue;
    seen[e]++;
    if (e === "comma" && !example) example = cell;
  }
  if (seen.dot > 0 && seen.comma > 0) {
    const separator = seen.comma > seen.dot ? "," : ".";
    return {
      separator,
      isAmbiguous: true,
      reason: `Numbers disagree: ${seen.comma} use a decimal comma and ${seen.dot} a decimal point; reading "${separator}" as the decimal separator. Check the file.`,
    };
  }
  if (seen.comma > 0) {
    return {
      separator: ",",
      isAmbiguous: false,
      reason: `Numbers use a decimal comma (for example ${example}).`,
    };
  }
  if (seen.dot > 0) {
    return { separator: ".", isAmbiguous: false, reason: "Numbers use a decimal point." };
  }
  if (seen.undecided > 0) {
    return {
      separator: fallback,
      isAmbiguous: true,
      reason: `Numbers such as 1,234 or 1.234 could use either separator; reading "${fallback}" as the decimal separator.`,
    };
  }
  return {
    separator: fallback,
    isAmbiguous: false,
    reason: `No fractional numbers to sample; reading "${fallback}" as the decimal separator.`,
  };
}

/** The unit most sample cells of a unit column name, or null. */
function majorityUnit<U extends string>(
  cells: readonly string[],
  parse: (raw: string) => U | null,
): U | null {
  const counts = new Map<U, number>();
  for (const cell of cells) {
    const unit = parse(cell);
    if (unit) counts.set(unit, (counts.get(unit) ?? 0) + 1);
  }
  let best: U | null = null;
  for (const [unit, n] of counts) if (best === null || n > (counts.get(best) ?? 0)) best = unit;
  return best;
}

/** The unit a header names, e.g. "Odometer (km)" or "Miles in"; "mileage" says nothing. */
function unitInHeader<U extends string>(
  header: string | undefined,
  parse: (raw: string) => U | null,
): U | null {
  if (!header) return null;
  const words = normaliseHeader(header).split(" ");
  for (let i = 0; i < words.length; i++) {
    const pair = words.slice(i, i + 2).join(" ");
    const unit = parse(pair) ?? parse(words[i] as string);
    if (unit) return unit;
  }
  return null;
}

function detectUnit<U extends string>(
  what: string,
  unitCells: readonly string[],
  header: string | undefined,
  parse: (raw: string) => U | null,
  fallback: U,
): { unit: U; reason: string } {
  const fromColumn = majorityUnit(unitCells, parse);
  if (fromColumn) {
    return {
      unit: fromColumn,
      reason: `${what} units come from the unit column (mostly ${fromColumn}); rows without one are read as ${fromColumn}.`,
    };
  }
  const fromHeader = unitInHeader(header, parse);
  if (fromHeader) {
    return {
      unit: fromHeader,
      reason: `${what} is in ${fromHeader}, from the header "${header}".`,
    };
  }
  return { unit: fallback, reason: `${what} unit not stated; reading ${fallback}.` };
}

/**
 * Read options for a file from its headers, mapping and a sample of rows (a few hundred is
 * plenty). Dates: see date-order.ts (a day above 12 decides; year-first is ISO; otherwise the
 * user is asked, and `defaults.dateFormat`, else month/day/year, only fills the place). Decimal separator: from numeric columns ("12,5" or
 * "1.234,56" mean a comma; "1,234" alone decides nothing). Units: from a unit column, else
 * from words in the mapped header ("km", "miles", "litres", "gal"), else the defaults.
 */
export function detectReadOptions(
  kind: ImportKind,
  headers: readonly string[],
  sampleRows: readonly (readonly string[])[],
  mapping: ColumnMapping,
  defaults: Partial<ReadOptions> = {},
): DetectedReadOptions {
  const base = { ...DEFAULT_READ_OPTIONS, ...defaults };
  const cellsOf = (accept: (t: ColumnType) => boolean) =>
    sampleCells(kind, mapping, sampleRows, accept);
  const headerOf = (key: string) => {
    const at = mapping[key];
    return typeof at === "number" ? headers[at] : undefined;
  };
  const dateOrder = detectDateOrder(dateCells(kind, headers, mapping, sampleRows));
  // Where the file leaves the order open, the fallback is only a placeholder: the import does
  // not start until the user chooses (needsDateOrder).
  const fallback = base.dateFormat === "iso" ? "mdy" : base.dateFormat;
  const dateFormat =
    dateOrder.status === "decided"
      ? dateOrder.format
      : dateOrder.status === "iso"
        ? "iso"
        : dateOrder.status === "ask"
          ? fallback
          : base.dateFormat;
  const decimal = detectDecimalSeparator(
    cellsOf((t) => NUMERIC_TYPES.has(t)),
    base.decimalSeparator,
  );
  const distance = detectUnit(
    "Odometer",
    cellsOf((t) => t === "distance-unit"),
    headerOf("odometer"),
    parseDistanceUnit,
    base.distanceUnit,
  );
  const volume = detectUnit(
    "Fuel volume",
    cellsOf((t) => t === "volume-unit"),
    headerOf("volume"),
    parseVolumeUnit,
    base.volumeUnit,
  );
  const hasType = (t: ColumnType) => IMPORT_COLUMNS[kind].some((c) => c.type === t);
  const reasons = [describeDateOrder(dateOrder, dateFormat), decimal.reason];
  if (hasType("distance")) reasons.push(distance.reason);
  if (hasType("volume")) reasons.push(volume.reason);
  return {
    options: {
      dateFormat,
      decimalSeparator: decimal.separator,
      distanceUnit: distance.unit,
      volumeUnit: volume.unit,
    },
    reasons,
    dateOrder,
    isAmbiguous: { dateFormat: needsDateOrder(dateOrder), decimalSeparator: decimal.isAmbiguous },
  };
}
