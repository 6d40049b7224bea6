/**
 * Row readers: one per import, built once, turning a CSV record (an array of strings) into a
 * typed row or a list of reasons to reject it. Cells are read with values.ts, then the typed
 * row is validated with the kind's zod schema (row-schemas.ts).
 *
 * What rejects a row, and what only warns:
 * - a required value missing or unreadable, any present value that cannot be read (a date that
 *   is no date, "12,5" where a decimal point is expected), a value out of range → rejection;
 * - a bad code inside a DTC list → warning, the code left out; a bad single DTC → rejection;
 * - a malformed VIN → rejection when the row has no unit number, else a warning and the VIN
 *   left out; a placeholder VIN → warning, treated as missing; a wrong check digit → warning
 *   (49 CFR 565 binds North American vehicles only);
 * - more fields than the header → rejection ("row has N fields, the header has M"); fewer →
 *   the missing trailing fields are read as blanks, with a warning (", read as blank");
 * - a symptom column value Recurra does not know → warning, read from the complaint instead.
 *
 * Cell text is kept as written: a cell such as "=HYPERLINK(...)" is plain text here and is
 * never evaluated. Exports neutralise such text (csv-export.ts).
 */
import type { z } from "zod";
import type { ImportKind } from "@/db/schema/operations";
import type { FaultStatus, Symptom } from "@/db/schema/records";
import type { Powertrain } from "@/db/schema/catalogue";
import { parseDtc, splitDtcList } from "@/lib/dtc";
import { checkVin } from "@/lib/vin";
import type { ColumnMapping } from "./mapping";
import { describeDateFormat } from "./date-order";
import type { ReadOptions } from "./read-options";
import {
  createRowSchema,
  type FaultRow,
  type FuelRow,
  type GenerationRow,
  type PartRow,
  type RepairRow,
  type TypedRow,
  type TypedRows,
  type VehicleRow,
} from "./row-schemas";
import { parseSymptom, symptomFromText } from "./symptoms";
import { isCleanValidVin } from "./vin-fast-path";
import {
  parseBoolean,
  formatDateNumber,
  parseDateNumber,
  parseDecimal,
  parseDistanceUnit,
  parseInteger,
  parseMoneyCents,
  parseTimestamp,
  parseVolumeUnit,
  parseYear,
  toLitres,
  toMiles,
  type DateFormat,
  type DecimalSeparator,
  type DistanceUnit,
  type VolumeUnit,
} from "./values";

export type RowIssue = {
  /** Canonical key of the column, or "" for the row as a whole. */
  column: string;
  message: string;
};

export type RowResult<T> =
  | { ok: true; rowNumber: number; row: T; warnings: readonly RowIssue[] }
  | { ok: false; rowNumber: number; issues: readonly RowIssue[] };

export type RowReader<K extends ImportKind> = (
  record: readonly string[],
  rowNumber: number,
) => RowResult<TypedRow<K>>;

export type RowReaderContext = {
  /** YYYY-MM-DD; dates after the following day are rejected. Defaults to today in UTC. */
  today?: string;
};

const UNIT_SUFFIX = /(?:Cents|Mi|L|Text)$/;
const CAPITAL = /[A-Z]/g;

/**
 * The canonical column key of a typed field, for messages: the unit or kind suffix dropped and
 * camelCase turned to snake_case ("partsCostCents" → "parts_cost", "odometerMi" → "odometer").
 */
export function columnKeyOfField(field: string): string {
  return field.replace(UNIT_SUFFIX, "").replace(CAPITAL, (c) => `_${c.toLowerCase()}`);
}

/** Cells that mean "nothing here" in exported spreadsheets. */
const EMPTY_MARKERS: ReadonlySet<string> = new Set([
  "-",
  "--",
  "---",
  "—",
  "–",
  "?",
  "n/a",
  "na",
  "#n/a",
  "null",
  "nil",
  "none",
  "unknown",
]);

/** 1 at the char codes EMPTY_MARKERS start with (either case), so most cells skip the lookup. */
const MARKER_STARTS = new Uint8Array(0x2100);
for (const m of EMPTY_MARKERS) {
  MARKER_STARTS[m.charCodeAt(0)] = 1;
  MARKER_STARTS[m.toUpperCase().charCodeAt(0)] = 1;
}

/** Printable ASCII other than space: a cell that starts and ends with one needs no trim. */
function isVisibleAscii(c: number): boolean {
  return c > 32 && c < 127;
}

function cleanCell(raw: string): string {
  const n = raw.length;
  if (n === 0) return raw;
  const s =
    isVisibleAscii(raw.charCodeAt(0)) && isVisibleAscii(raw.charCodeAt(n - 1)) ? raw : raw.trim();
  if (s.length > 7 || MARKER_STARTS[s.charCodeAt(0)] !== 1) return s;
  return EMPTY_MARKERS.has(s.toLowerCase()) ? "" : s;
}

/** True when every field of the record is blank (a spreadsheet's trailing ",,,," line). */
export function isBlankRecord(record: readonly string[]): boolean {
  for (const cell of record) if (cleanCell(cell) !== "") return false;
  return true;
}

const SHOWN_MAX = 60;

function shown(cell: string): string {
  return cell.length > SHOWN_MAX ? `${cell.slice(0, SHOWN_MAX - 1)}…` : cell;
}

const FAULT_STATUS_WORDS: ReadonlyMap<string, FaultStatus> = new Map([
  ["pending", "pending"],
  ["pend", "pending"],
  ["confirmed", "confirmed"],
  ["stored", "confirmed"],
  ["active", "confirmed"],
  ["current", "confirmed"],
  ["permanent", "permanent"],
  ["perm", "permanent"],
]);

const POWERTRAIN_WORDS: ReadonlyMap<string, Powertrain> = new Map([
  ["combustion", "combustion"],
  ["ice", "combustion"],
  ["petrol", "combustion"],
  ["gasoline", "combustion"],
  ["diesel", "combustion"],
  ["hybrid", "hybrid"],
  ["hev", "hybrid"],
  ["phev", "hybrid"],
  ["mhev", "hybrid"],
  ["plug-in hybrid", "hybrid"],
  ["mild hybrid", "hybrid"],
  ["electric", "electric"],
  ["ev", "electric"],
  ["bev", "electric"],
  ["battery electric", "electric"],
]);
const powertrain = (cell: string): Powertrain | null =>
  POWERTRAIN_WORDS.get(cell.trim().toLowerCase()) ?? null;

const dtcCode = (cell: string): string | null => parseDtc(cell)?.code ?? null;
const faultStatus = (cell: string): FaultStatus | null =>
  FAULT_STATUS_WORDS.get(cell.toLowerCase()) ?? null;

/** A mapped column: its key and 0-based index, -1 when the file lacks it. */
type Col = { key: string; at: number };

type VinVerdict =
  | { kind: "ok"; vin: string }
  | { kind: "check-digit"; vin: string; problem: string }
  | { kind: "placeholder" }
  | { kind: "malformed"; problems: string };

function vinVerdict(raw: string): VinVerdict {
  const check = checkVin(raw);
  if (!check.isWellFormed) return { kind: "malformed", problems: check.problems.join(" ") };
  if (check.isPlaceholder) return { kind: "placeholder" };
  if (!check.hasValidCheckDigit) {
    const problem = check.problems.find((p) => p.startsWith("Check digit")) ?? "";
    return { kind: "check-digit", vin: check.vin, problem };
  }
  return { kind: "ok", vin: check.vin };
}

/** Entries a per-reader memo holds before it starts again, so memory stays bounded. */
const MEMO_LIMIT = 100_000;

/**
 * Per-reader memo of pure per-value work that repeats across rows: the VINs that the quick
 * check leaves to checkVin, the code lists of a file. Cleared when full, so memory stays
 * bounded whatever the file holds.
 */
class Memo<V> {
  private readonly map = new Map<string, V>();
  constructor(
    private readonly compute: (key: string) => V,
    private readonly limit = MEMO_LIMIT,
  ) {}
  get(key: string): V {
    let v = this.map.get(key);
    if (v === undefined) {
      if (this.map.size >= this.limit) this.map.clear();
      v = this.compute(key);
      this.map.set(key, v);
    }
    return v;
  }
}

/**
 * The state of reading one row: the record, issues found so far, and the cell readers. One
 * instance per row reader, reused for every row.
 */
class RowScratch {
  record: readonly string[] = [];
  errors: RowIssue[] | null = null;
  warnings: RowIssue[] | null = null;
  vin: string | null = null;
  unitNumber: string | null = null;
  /** Units used for this row's odometer and volume, shown in range messages. */
  distanceUnit: DistanceUnit;
  volumeUnit: VolumeUnit;
  private readonly vins = new Memo(vinVerdict);
  private readonly dtcLists = new Memo((cell: string) => splitDtcList(cell));
  /** Formatted dates seen so far, by YYYYMMDD: integer keys, no string hashing per cell. */
  private readonly dateStrings = new Map<number, string>();

  private readonly dateFormat: DateFormat;
  private readonly decimalSeparator: DecimalSeparator;
  // Bound once: a closure made per cell costs on every row.
  private readonly parseTimestampCell: (c: string) => string | null;
  private readonly parseIntegerCell: (c: string) => number | null;
  private readonly notDate: string;
  private readonly notTimestamp: string;
  private readonly notNumber: string;
  private readonly notMoney: string;

  constructor(readonly options: ReadOptions) {
    const { dateFormat, decimalSeparator } = options;
    this.dateFormat = dateFormat;
    this.decimalSeparator = decimalSeparator;
    this.distanceUnit = options.distanceUnit;
    this.volumeUnit = options.volumeUnit;
    this.parseTimestampCell = (c) => parseTimestamp(c, dateFormat);
    this.parseIntegerCell = (c) => parseInteger(c, decimalSeparator);
    const dateWords = describeDateFormat(dateFormat);
    const numberWords = decimalSeparator === "," ? "with a decimal comma" : "with a decimal point";
    this.notDate = `is not a date (${dateWords})`;
    this.notTimestamp = `is not a date and time (${dateWords} hh:mm)`;
    this.notNumber = `is not a number ${numberWords}`;
    this.notMoney = `is not an amount of money ${numberWords}`;
  }

  start(record: readonly string[]): void {
    this.record = record;
    this.errors = null;
    this.warnings = null;
    this.distanceUnit = this.options.distanceUnit;
    this.volumeUnit = this.options.volumeUnit;
  }

  cell(col: Col): string {
    if (col.at < 0) return "";
    const raw = this.record[col.at];
    return raw === undefined ? "" : cleanCell(raw);
  }

  fail(column: string, message: string): void {
    (this.errors ??= []).push({ column, message });
  }

  warn(column: string, message: string): void {
    (this.warnings ??= []).push({ column, message });
  }

  /** Records that a present value could not be read (the row will be rejected); null. */
  private unreadable(col: Col, cell: string, what: string): null {
    this.fail(col.key, `${col.key}: ${shown(cell)} ${what}`);
    return null;
  }

  /** Reads a non-empty cell with `parse`; an unreadable value rejects the row. */
  private read<T>(col: Col, parse: (cell: string) => T | null, what: string): T | null {
    const cell = this.cell(col);
    if (cell === "") return null;
    return parse(cell) ?? this.unreadable(col, cell, what);
  }

  text(col: Col): string | null {
    const cell = this.cell(col);
    return cell === "" ? null : cell;
  }

  // The readers of the common columns call their parser directly: a parser handed to `read`
  // as an argument makes that call site megamorphic, which costs on every cell.

  date(col: Col): string | null {
    const cell = this.cell(col);
    if (cell === "") return null;
    const n = parseDateNumber(cell, this.dateFormat);
    return n < 0 ? this.unreadable(col, cell, this.notDate) : this.dateText(n);
  }

  /** The YYYY-MM-DD text of a YYYYMMDD number, kept once per date. */
  private dateText(n: number): string {
    let text = this.dateStrings.get(n);
    if (text === undefined) {
      if (this.dateStrings.size >= MEMO_LIMIT) this.dateStrings.clear();
      text = formatDateNumber(n);
      this.dateStrings.set(n, text);
    }
    return text;
  }

  decimal(col: Col): number | null {
    const cell = this.cell(col);
    if (cell === "") return null;
    return parseDecimal(cell, this.decimalSeparator) ?? this.unreadable(col, cell, this.notNumber);
  }

  money(col: Col): number | null {
    const cell = this.cell(col);
    if (cell === "") return null;
    const cents = parseMoneyCents(cell, this.decimalSeparator);
    return cents ?? this.unreadable(col, cell, this.notMoney);
  }

  /** A yes/no column; blank is no (the "x or blank" habit). */
  flag(col: Col): boolean {
    const cell = this.cell(col);
    if (cell === "") return false;
    return parseBoolean(cell) ?? this.unreadable(col, cell, "is not yes or no") ?? false;
  }

  timestamp(col: Col): string | null {
    return this.read(col, this.parseTimestampCell, this.notTimestamp);
  }

  integer(col: Col): number | null {
    return this.read(col, this.parseIntegerCell, "is not a whole number");
  }

  year(col: Col): number | null {
    return this.read(col, parseYear, "is not a year");
  }

  /** An odometer reading in miles; `unitCol` (vehicles only) gives the row's own unit. */
  odometer(col: Col, unitCol?: Col): number | null {
    if (unitCol) {
      const unit = this.read(unitCol, parseDistanceUnit, "is not mi or km");
      if (unit) this.distanceUnit = unit;
    }
    const v = this.decimal(col);
    return v === null ? null : toMiles(v, this.distanceUnit);
  }

  volume(col: Col, unitCol: Col): number | null {
    const unit = this.read(unitCol, parseVolumeUnit, "is not L, US gal or imp gal");
    if (unit) this.volumeUnit = unit;
    const v = this.decimal(col);
    return v === null ? null : toLitres(v, this.volumeUnit);
  }

  /** Sets this.vin and this.unitNumber by the VIN rules in this file's header. */
  vehicleKeys(vinCol: Col, unitCol: Col): void {
    const unitNumber = this.text(unitCol);
    const cell = this.cell(vinCol);
    this.unitNumber = unitNumber;
    this.vin = null;
    if (cell === "") return;
    if (isCleanValidVin(cell)) {
      this.vin = cell;
      return;
    }
    const verdict = this.vins.get(cell);
    const key = vinCol.key;
    switch (verdict.kind) {
      case "ok":
        this.vin = verdict.vin;
        return;
      case "check-digit":
        this.vin = verdict.vin;
        this.warn(
          key,
          `${key}: ${cell}: ${verdict.problem} Kept: the check digit is required only on North American vehicles.`,
        );
        return;
      case "placeholder":
        this.warn(key, `${key}: ${cell} is a placeholder, not a real VIN; treated as missing.`);
        return;
      case "malformed":
        if (unitNumber === null) {
          this.fail(
            key,
            `${key}: ${shown(cell)} is not a VIN (${verdict.problems}) and the row has no unit number.`,
          );
        } else {
          this.warn(
            key,
            `${key}: ${shown(cell)} is not a VIN (${verdict.problems}); left out, the row is matched by its unit number.`,
          );
        }
    }
  }

  /** Valid codes of a DTC list (a fresh array per row); invalid ones are left out with a warning. */
  dtcList(col: Col): string[] {
    const cell = this.cell(col);
    if (cell === "") return [];
    const { valid, invalid } = this.dtcLists.get(cell);
    if (invalid.length > 0) {
      const list = invalid.map(shown).join(", ");
      const verb = invalid.length === 1 ? "is not a DTC" : "are not DTCs";
      this.warn(col.key, `${col.key}: ${list} ${verb} (SAE J2012 structure) and left out.`);
    }
    return valid.slice(); // the memo's array is shared; each row owns its own
  }

  dtc(col: Col): string | null {
    return this.read(
      col,
      dtcCode,
      "is not a DTC (SAE J2012: a letter P, C, B or U, a digit 0–3, three hexadecimal characters)",
    );
  }

  powertrain(col: Col): Powertrain | null {
    return this.read(col, powertrain, "is not combustion, hybrid or electric");
  }

  status(col: Col): FaultStatus {
    const status = this.read(col, faultStatus, "is not pending, confirmed or permanent");
    return status ?? "confirmed";
  }

  /** The symptom column if it holds a known value, else read from the complaint. */
  symptom(col: Col, complaint: string | null): Symptom | null {
    const cell = this.cell(col);
    if (cell !== "") {
      const s = parseSymptom(cell);
      if (s) return s;
      this.warn(
        col.key,
        `${col.key}: ${shown(cell)} is not a symptom Recurra knows; read from the complaint instead.`,
      );
    }
    return complaint === null ? null : symptomFromText(complaint);
  }
}

function columnsOf<const K extends string>(mapping: ColumnMapping, keys: readonly K[]) {
  const cols = {} as Record<K, Col>;
  for (const key of keys) {
    const at = mapping[key];
    cols[key] = { key, at: typeof at === "number" ? at : -1 };
  }
  return cols;
}

const EVENT_VEHICLE_KEYS = ["vin", "unit_number", "make", "model", "model_year"] as const;

/** Builders of each kind's candidate row from the current record of `s`. */
const BUILDERS: {
  [K in ImportKind]: (mapping: ColumnMapping, s: RowScratch) => () => TypedRows[K];
} = {
  vehicles(mapping, s) {
    const c = columnsOf(mapping, [
      ...EVENT_VEHICLE_KEYS,
      "engine",
      "transmission",
      "in_service_date",
      "odometer",
      "odometer_unit",
    ]);
    return (): VehicleRow => {
      s.vehicleKeys(c.vin, c.unit_number);
      const odometerMi = s.odometer(c.odometer, c.odometer_unit);
      return {
        unitNumber: s.unitNumber,
        vin: s.vin,
        make: s.text(c.make) as string,
        model: s.text(c.model) as string,
        modelYear: s.year(c.model_year) as number,
        engine: s.text(c.engine),
        transmission: s.text(c.transmission),
        inServiceDate: s.date(c.in_service_date),
        odometerMi,
        odometerUnit: s.distanceUnit,
      };
    };
  },
  repairs(mapping, s) {
    const c = columnsOf(mapping, [
      ...EVENT_VEHICLE_KEYS,
      "ro_number",
      "opened_on",
      "closed_on",
      "odometer",
      "complaint",
      "cause",
      "correction",
      "dtc_codes",
      "component",
      "symptom",
      "labor_hours",
      "parts_cost",
      "labor_cost",
      "part_numbers",
      "technician",
      "vendor",
      "is_warranty",
    ]);
    return (): RepairRow => {
      s.vehicleKeys(c.vin, c.unit_number);
      const complaint = s.text(c.complaint);
      return {
        roNumber: s.text(c.ro_number) as string,
        unitNumber: s.unitNumber,
        vin: s.vin,
        openedOn: s.date(c.opened_on) as string,
        closedOn: s.date(c.closed_on),
        odometerMi: s.odometer(c.odometer),
        complaint,
        cause: s.text(c.cause),
        correction: s.text(c.correction),
        dtcCodes: s.dtcList(c.dtc_codes),
        componentText: s.text(c.component),
        symptom: s.symptom(c.symptom, complaint),
        laborHours: s.decimal(c.labor_hours),
        partsCostCents: s.money(c.parts_cost),
        laborCostCents: s.money(c.labor_cost),
        partNumbers: s.text(c.part_numbers),
        technician: s.text(c.technician),
        vendor: s.text(c.vendor),
        isWarranty: s.flag(c.is_warranty),
        make: s.text(c.make),
        model: s.text(c.model),
        modelYear: s.year(c.model_year),
      };
    };
  },
  faults(mapping, s) {
    const c = columnsOf(mapping, [
      ...EVENT_VEHICLE_KEYS,
      "occurred_at",
      "odometer",
      "dtc",
      "mil_on",
      "status",
    ]);
    return (): FaultRow => {
      s.vehicleKeys(c.vin, c.unit_number);
      return {
        unitNumber: s.unitNumber,
        vin: s.vin,
        occurredAt: s.timestamp(c.occurred_at) as string,
        odometerMi: s.odometer(c.odometer),
        dtc: s.dtc(c.dtc) as string,
        milOn: s.flag(c.mil_on),
        status: s.status(c.status),
        make: s.text(c.make),
        model: s.text(c.model),
        modelYear: s.year(c.model_year),
      };
    };
  },
  fuel(mapping, s) {
    const c = columnsOf(mapping, [
      ...EVENT_VEHICLE_KEYS,
      "filled_at",
      "odometer",
      "volume",
      "volume_unit",
      "price_total",
      "station",
    ]);
    return (): FuelRow => {
      s.vehicleKeys(c.vin, c.unit_number);
      return {
        unitNumber: s.unitNumber,
        vin: s.vin,
        filledAt: s.timestamp(c.filled_at) as string,
        odometerMi: s.odometer(c.odometer),
        volumeL: s.volume(c.volume, c.volume_unit),
        priceTotalCents: s.money(c.price_total),
        station: s.text(c.station),
        make: s.text(c.make),
        model: s.text(c.model),
        modelYear: s.year(c.model_year),
      };
    };
  },
  parts(mapping, s) {
    const c = columnsOf(mapping, [
      "part_number",
      "description",
      "component",
      "on_hand",
      "unit_cost",
      "lead_time_days",
    ]);
    return (): PartRow => ({
      partNumber: s.text(c.part_number) as string,
      description: s.text(c.description) as string,
      componentText: s.text(c.component),
      onHand: s.integer(c.on_hand),
      unitCostCents: s.money(c.unit_cost),
      leadTimeDays: s.integer(c.lead_time_days),
    });
  },
  generations(mapping, s) {
    const c = columnsOf(mapping, [
      "make",
      "model",
      "generation",
      "year_from",
      "year_to",
      "powertrain",
    ]);
    return (): GenerationRow => ({
      make: s.text(c.make) as string,
      model: s.text(c.model) as string,
      generation: s.text(c.generation) as string,
      yearFrom: s.year(c.year_from) as number,
      yearTo: s.year(c.year_to) as number,
      powertrain: s.powertrain(c.powertrain),
    });
  },
};

const NO_ISSUES: readonly RowIssue[] = Object.freeze([]);

function todayUtc(): string {
  return new Date().toISOString().slice(0, 10);
}

/**
 * A reader for the rows of one import. Build it once (it compiles the kind's schema and
 * resolves the mapping) and call it for every record. Throws when the mapping points outside
 * the header row; run validateMapping first to tell the user why.
 *
 * Required values are typed as present (`roNumber: string`) only after zod has checked them:
 * the builders put null where a value is missing and the schema rejects it.
 */
export function createRowReader<K extends ImportKind>(
  kind: K,
  headers: readonly string[],
  mapping: ColumnMapping,
  options: ReadOptions,
  context: RowReaderContext = {},
): RowReader<K> {
  for (const [key, at] of Object.entries(mapping)) {
    if (at !== null && (!Number.isInteger(at) || at < 0 || at >= headers.length)) {
      throw new Error(
        `createRowReader: ${key} points at column ${at + 1}, but the file has ${headers.length} columns`,
      );
    }
  }
  const schema = createRowSchema(kind, { today: context.today ?? todayUtc() });
  const s = new RowScratch(options);
  const build = BUILDERS[kind](mapping, s) as () => TypedRow<K>;
  const headerCount = headers.length;

  const rawOf = (key: string): string => {
    const at = mapping[key];
    return typeof at === "number" ? cleanCell(s.record[at] ?? "") : "";
  };

  const describe = (issue: z.core.$ZodIssue): RowIssue => {
    const field = String(issue.path[0] ?? "");
    const key = columnKeyOfField(field);
    const raw = rawOf(key);
    const isStandalone = issue.code === "custom" && issue.params?.standalone === true;
    if (raw === "" || isStandalone) return { column: key, message: `${key}: ${issue.message}` };
    const unit =
      field === "odometerMi" ? ` ${s.distanceUnit}` : field === "volumeL" ? ` ${s.volumeUnit}` : "";
    return { column: key, message: `${key}: ${shown(raw)}${unit} ${issue.message}` };
  };

  return (record, rowNumber) => {
    if (isBlankRecord(record)) {
      return { ok: false, rowNumber, issues: [{ column: "", message: "The row is empty." }] };
    }
    // A field too many means the columns cannot be trusted (a stray delimiter): rejected. A
    // shorter row is read as it is, the missing fields at its end as blanks (exports often
    // drop trailing empty cells), with a warning.
    if (record.length > headerCount) {
      const message = `row has ${record.length} fields, the header has ${headerCount}`;
      return { ok: false, rowNumber, issues: [{ column: "", message }] };
    }
    s.start(record);
    if (record.length < headerCount) {
      s.warn("", `row has ${record.length} fields, the header has ${headerCount}, read as blank`);
    }
    const candidate = build();
    // zod's compiled validator answers yes or no without building a copy of the row (the
    // candidate is a fresh object with exactly the schema's fields, and no field transforms);
    // only a failing row is parsed again, for zod's issues.
    const isValid = schema.validate(candidate);
    if (isValid && s.errors === null) {
      return { ok: true, rowNumber, row: candidate, warnings: s.warnings ?? NO_ISSUES };
    }
    const issues: RowIssue[] = s.errors ?? [];
    const parsed = isValid ? null : schema.safeParse(candidate);
    if (parsed && !parsed.success) {
      const failed = new Set(issues.map((i) => i.column));
      for (const issue of parsed.error.issues) {
        const described = describe(issue);
        if (!failed.has(described.column)) issues.push(described);
      }
    }
    if (s.warnings) issues.push(...s.warnings);
    return { ok: false, rowNumber, issues };
  };
}
