import { parse } from "csv-parse/sync";
import type { ImportKind } from "@/db/schema";
import {
  autoMapHeaders,
  checkCsvBytes,
  createRowReader,
  detectReadOptions,
  guessKind,
  IMPORT_COLUMNS,
  sniffDelimiter,
  stripBom,
  validateMapping,
  describeDateOrder,
  needsDateOrder,
  type ColumnMapping,
  type CsvDelimiter,
  type DateFormat,
  type DateOrder,
  type ReadOptions,
} from "@/lib/import";
import { importParseOptions, MAX_RECORD_CHARS } from "./csv-stream";
import { HEAD_BYTES } from "./storage";

export const PREVIEW_ROWS = 20;
/** Rows of the head that the date order, decimal separator and units are learnt from. */
export const SAMPLED_ROWS = 1_000;

const KIND_WORDS: Record<ImportKind, string> = {
  vehicles: "a vehicle roster",
  repairs: "repair orders",
  faults: "fault-code events",
  fuel: "fuel-card transactions",
  parts: "a parts list",
  generations: "a generation catalogue",
};

export type Inspection = {
  delimiter: CsvDelimiter;
  headers: string[];
  /** First rows as they will be read (raw cells). */
  sampleRows: string[][];
  mapping: ColumnMapping;
  read: ReadOptions;
  /**
   * Whether the file decides the order of its dates or the user must choose it (then
   * `read.dateFormat` only fills the place: see resolveDateFormat).
   */
  dateOrder: DateOrder;
  /** Why the reading options were chosen, and where they are a guess. */
  readNotes: string[];
  /** Problems that stop the import until fixed (mapping problems can be fixed on screen). */
  problems: string[];
  /** Worth knowing, not blocking (e.g. "this looks like a fuel file"). */
  notices: string[];
};

/** Header names for a mapping, so it can be remembered across files with the same headers. */
export function mappingByName(
  headers: string[],
  mapping: ColumnMapping,
): Record<string, string | null> {
  return Object.fromEntries(
    Object.entries(mapping).map(([key, at]) => [key, at === null ? null : (headers[at] ?? null)]),
  );
}

/**
 * Looks at the head of an uploaded file: is it CSV text, which delimiter, the header row, the
 * first rows, the automatic column mapping (overlaid with the organisation's remembered one),
 * and the date order, decimal separator and units, learnt from up to SAMPLED_ROWS rows.
 */
export function inspectUpload(
  head: Buffer,
  kind: ImportKind,
  opts: {
    isTruncated: boolean;
    remembered?: Record<string, string | null> | null;
    /** The mapping on the screen (by header name), when it is being edited. */
    mapping?: Record<string, string | null>;
    defaults?: Partial<ReadOptions>;
  },
): Inspection {
  // A head cut mid-file may end inside a character or a row: keep whole lines only (a line
  // ends at LF or, as in the full read, at a lone CR).
  const lineEnd = Math.max(head.lastIndexOf(0x0a), head.lastIndexOf(0x0d));
  const whole = opts.isTruncated ? head.subarray(0, Math.max(0, lineEnd + 1)) : head;
  const empty: Inspection = {
    delimiter: ",",
    headers: [],
    sampleRows: [],
    mapping: {},
    read: { dateFormat: "iso", decimalSeparator: ".", distanceUnit: "mi", volumeUnit: "us-gal" },
    dateOrder: { status: "none" },
    readNotes: [],
    problems: [],
    notices: [],
  };
  const check = checkCsvBytes(whole);
  if (!check.ok) return { ...empty, problems: [check.message] };
  const text = stripBom(whole.toString("utf8"));
  if (text.trim() === "") return { ...empty, problems: ["The file is empty."] };
  const delimiter = sniffDelimiter(text.slice(0, 64 * 1024));
  const parseHead = (rows: number) =>
    parse(text, {
      ...importParseOptions(delimiter),
      skip_empty_lines: true,
      to: rows + 1,
    }) as string[][];
  let records: string[][];
  try {
    try {
      records = parseHead(SAMPLED_ROWS);
    } catch {
      // Something further down cannot be read (or the head's cut falls inside a quoted field):
      // learn from the top rows; the import reports the problem at its row.
      records = parseHead(PREVIEW_ROWS);
    }
  } catch (e) {
    const code = (e as { code?: string }).code;
    const message =
      code === "CSV_QUOTE_NOT_CLOSED"
        ? 'A quoted field near the top of the file is never closed (a missing ").'
        : code === "CSV_MAX_RECORD_SIZE"
          ? `The first row is longer than ${MAX_RECORD_CHARS.toLocaleString("en-GB")} characters; is this really a CSV file?`
          : `The top of the file cannot be read as CSV: ${(e as Error).message}`;
    return { ...empty, delimiter, problems: [message] };
  }
  const headers = (records[0] ?? []).map((h) => h.trim());
  const sampleRows = records.slice(1, PREVIEW_ROWS + 1);
  const auto = autoMapHeaders(kind, headers);
  const mapping: ColumnMapping = { ...auto.mapping };
  // The mapping being edited, exactly; else the remembered one where its headers are here.
  for (const [key, name] of Object.entries(opts.mapping ?? opts.remembered ?? {})) {
    const at = name === null ? -1 : headers.indexOf(name);
    if (!(key in mapping)) continue;
    if (at >= 0) mapping[key] = at;
    else if (opts.mapping && name === null) mapping[key] = null;
  }
  const problems: string[] = [];
  const notices: string[] = [];
  for (const name of auto.duplicateHeaders) {
    problems.push(
      `The header row has “${name}” more than once. Rename one copy so it is clear which to read.`,
    );
  }
  problems.push(...validateMapping(kind, headers, mapping).filter((p) => !problems.includes(p)));
  if (sampleRows.length === 0)
    notices.push("The file has a header row but no data rows in its first part.");
  const best = guessKind(headers)[0];
  if (
    best &&
    best.kind !== kind &&
    best.missingRequired.length === 0 &&
    auto.missingRequired.length > 0
  ) {
    notices.push(
      `This looks like ${KIND_WORDS[best.kind]}, not ${KIND_WORDS[kind]}. Check the kind you chose.`,
    );
  }
  const detected = detectReadOptions(kind, headers, records.slice(1), mapping, opts.defaults);
  const readNotes = [...detected.reasons];
  return {
    delimiter,
    headers,
    sampleRows,
    mapping,
    read: detected.options,
    dateOrder: detected.dateOrder,
    readNotes,
    problems,
    notices,
  };
}

/**
 * The date order an import reads its file with: the one the user chose, else the file's own.
 * When the file leaves the order open (every sampled date fits both, or they disagree) and
 * none was chosen, the answer is the question instead: the import must not start on a guess.
 * The start route and the command line both ask here.
 */
export function resolveDateFormat(
  inspection: Pick<Inspection, "dateOrder" | "read">,
  chosen: DateFormat | undefined,
): { ok: true; dateFormat: DateFormat } | { ok: false; message: string } {
  if (chosen) return { ok: true, dateFormat: chosen };
  if (needsDateOrder(inspection.dateOrder)) {
    return {
      ok: false,
      message: describeDateOrder(inspection.dateOrder, inspection.read.dateFormat),
    };
  }
  return { ok: true, dateFormat: inspection.read.dateFormat };
}

/** The canonical columns of a kind, for the mapping screen. */
export function columnsOf(kind: ImportKind) {
  return IMPORT_COLUMNS[kind].map((c) => ({
    key: c.key,
    label: c.label,
    isRequired: c.isRequired,
  }));
}

export { HEAD_BYTES };

export type PreviewRow =
  | { rowNumber: number; ok: true; values: Record<string, unknown>; warnings: string[] }
  | { rowNumber: number; ok: false; issues: string[] };

/** The first rows as the import will read them with this mapping and these options. */
export function previewRows(
  kind: ImportKind,
  inspection: Pick<Inspection, "headers" | "sampleRows">,
  mapping: ColumnMapping,
  read: ReadOptions,
): PreviewRow[] {
  const reader = createRowReader(kind, inspection.headers, mapping, read);
  return inspection.sampleRows.map((record, i) => {
    const result = reader(record, i + 2);
    return result.ok
      ? {
          rowNumber: result.rowNumber,
          ok: true,
          values: result.row as Record<string, unknown>,
          warnings: result.warnings.map((w) => w.message),
        }
      : { rowNumber: result.rowNumber, ok: false, issues: result.issues.map((w) => w.message) };
  });
}
