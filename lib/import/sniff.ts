/**
 * First looks at an uploaded file: is it text at all, is it UTF-8, which delimiter does it use.
 * Enough to refuse a workbook, a PDF or a mis-encoded export with a message the user can act on.
 */

const BOM = "\uFEFF";

/** The text without a leading UTF-8 byte-order mark. */
export function stripBom(text: string): string {
  return text.startsWith(BOM) ? text.slice(1) : text;
}

export const CSV_DELIMITERS = [",", ";", "\t"] as const;
export type CsvDelimiter = (typeof CSV_DELIMITERS)[number];

const MAX_SNIFF_RECORDS = 20;

/** Per record, how many of each delimiter stand outside double quotes. */
function countDelimiters(text: string): number[][] {
  const records: number[][] = [];
  let counts = [0, 0, 0];
  let inQuotes = false;
  for (let i = 0; i < text.length && records.length < MAX_SNIFF_RECORDS; i++) {
    const ch = text[i];
    if (ch === '"') {
      inQuotes = !inQuotes; // a doubled quote toggles twice: net no change
      continue;
    }
    if (inQuotes) continue;
    if (ch === "\n" || ch === "\r") {
      if (ch === "\r" && text[i + 1] === "\n") i++;
      records.push(counts);
      counts = [0, 0, 0];
      continue;
    }
    const d = CSV_DELIMITERS.indexOf(ch as CsvDelimiter);
    if (d >= 0) (counts[d] as number)++;
  }
  // The text may stop mid-record: a last record without a line end counts only when no record
  // was complete. Blank lines say nothing.
  if (records.length === 0) records.push(counts);
  const withDelimiters = records.filter((r) => r.some((c) => c > 0));
  return withDelimiters.length > 0 ? withDelimiters : records;
}

/**
 * The delimiter of a CSV file from its first lines: the candidate that appears, outside quoted
 * fields, the same number of times on every record (and most often when several do); failing
 * that, the one seen on most records. "," when nothing decides.
 */
export function sniffDelimiter(firstLines: string): CsvDelimiter {
  const records = countDelimiters(stripBom(firstLines));
  let best: CsvDelimiter = ",";
  let bestScore = 0;
  CSV_DELIMITERS.forEach((delimiter, d) => {
    const perRecord = records.map((r) => r[d] as number);
    const first = perRecord[0] ?? 0;
    if (first === 0) return;
    const isConsistent = perRecord.every((c) => c === first);
    const recordsWithIt = perRecord.filter((c) => c > 0).length;
    // Consistency first, then the number of fields it makes, then how many records carry it.
    const score = isConsistent ? 1_000_000 + first : recordsWithIt * 1_000 + first;
    if (score > bestScore) {
      bestScore = score;
      best = delimiter;
    }
  });
  return best;
}

const SAMPLE_BYTES = 64 * 1024;
/** Share of control characters above which a file is not text (common practice: ~10%). */
const MAX_CONTROL_SHARE = 0.1;

/**
 * True when the bytes are not a text file: a NUL byte in the first 64 KiB, or more than 10% of
 * them control characters other than tab, line feed, form feed and carriage return.
 */
export function looksBinary(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, SAMPLE_BYTES);
  if (n === 0) return false;
  let control = 0;
  for (let i = 0; i < n; i++) {
    const b = bytes[i] as number;
    if (b === 0) return true;
    if ((b < 32 && b !== 9 && b !== 10 && b !== 12 && b !== 13) || b === 127) control++;
  }
  return control / n > MAX_CONTROL_SHARE;
}

const utf8 = new TextDecoder("utf-8", { fatal: true });

/** True when the bytes are well-formed UTF-8 (plain ASCII is). */
export function isValidUtf8(bytes: Uint8Array): boolean {
  try {
    utf8.decode(bytes);
    return true;
  } catch {
    return false;
  }
}

function startsWith(bytes: Uint8Array, prefix: readonly number[]): boolean {
  return prefix.every((b, i) => bytes[i] === b);
}

/** Signatures of files people upload by mistake, with what to tell them. */
const KNOWN_SIGNATURES: readonly { prefix: readonly number[]; message: string }[] = [
  {
    prefix: [0x50, 0x4b, 0x03, 0x04],
    message:
      "This is a zipped file, most likely a spreadsheet workbook (.xlsx). Save the sheet as CSV (UTF-8) and upload that.",
  },
  {
    prefix: [0xd0, 0xcf, 0x11, 0xe0],
    message:
      "This is an older spreadsheet workbook (.xls). Save the sheet as CSV (UTF-8) and upload that.",
  },
  {
    prefix: [0x25, 0x50, 0x44, 0x46],
    message: "This is a PDF document, not a CSV file. Export the data as CSV and upload that.",
  },
  {
    prefix: [0xff, 0xfe],
    message: "This file is saved as UTF-16 text. Save it as CSV (UTF-8) and upload it again.",
  },
  {
    prefix: [0xfe, 0xff],
    message: "This file is saved as UTF-16 text. Save it as CSV (UTF-8) and upload it again.",
  },
];

export type FileCheck = { ok: true } | { ok: false; message: string };

/**
 * Whether an upload can be read as a CSV text file, with a message for the user when not:
 * known non-CSV files by their first bytes, then binary content, then encodings other than
 * UTF-8.
 */
export function checkCsvBytes(bytes: Uint8Array): FileCheck {
  if (bytes.length === 0) return { ok: false, message: "The file is empty." };
  const known = KNOWN_SIGNATURES.find((s) => startsWith(bytes, s.prefix));
  if (known) return { ok: false, message: known.message };
  if (looksBinary(bytes)) {
    return { ok: false, message: "This file is not text, so it cannot be a CSV file." };
  }
  if (!isValidUtf8(bytes)) {
    return {
      ok: false,
      message:
        "This file is not UTF-8 text (perhaps an older Windows or Mac encoding). Save it as CSV (UTF-8) and upload it again.",
    };
  }
  return { ok: true };
}
