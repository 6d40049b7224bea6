/**
 * Writing CSV that is safe to open in a spreadsheet: RFC 4180 quoting and the OWASP guidance on
 * CSV injection ("CSV Injection", OWASP Foundation).
 */

export type CsvValue = string | number | boolean | null | undefined;

/** Characters that make a spreadsheet read a cell as a formula (OWASP CSV injection). */
const FORMULA_TRIGGERS = new Set(["=", "+", "-", "@", "\t", "\r"]);

/** A plain decimal number such as "-12.5" or "+3": no operators after the sign. */
const PLAIN_NUMBER = /^[-+]?\d+(\.\d+)?$/;

/**
 * A cell's text, neutralised against formula injection: text that starts with =, +, -, @, tab
 * or carriage return gets a leading single quote (OWASP CSV injection), so "=1+1" is written
 * "'=1+1".
 *
 * Recurra's rule for numbers: a JavaScript number is written as it is (a number cannot carry a
 * formula), and so is a string that is nothing but a plain decimal number, such as "-12.5" or
 * "+3", so that negative amounts stay numbers in the spreadsheet. "-2+3" is not plain and is
 * quoted. null and undefined are empty cells.
 */
export function csvSafeCell(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  const text = String(value);
  const first = text[0];
  if (first === undefined || !FORMULA_TRIGGERS.has(first)) return text;
  return PLAIN_NUMBER.test(text) ? text : `'${text}`;
}

const NEEDS_QUOTES = /[",\r\n]/;

/** RFC 4180 §2: a field with a comma, double quote or line break is quoted; quotes doubled. */
function quoteField(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/**
 * A CSV document: header row and rows, every cell through csvSafeCell, fields quoted per
 * RFC 4180, records ended with CRLF (RFC 4180 §2). `withBom` puts a UTF-8 byte-order mark in
 * front, which some spreadsheet programs need to read accented letters correctly.
 */
export function toCsv(
  headers: readonly CsvValue[],
  rows: readonly (readonly CsvValue[])[],
  options: { withBom?: boolean } = {},
): string {
  const line = (cells: readonly CsvValue[]) =>
    cells.map((c) => quoteField(csvSafeCell(c))).join(",") + "\r\n";
  const body = [headers, ...rows].map(line).join("");
  return options.withBom ? `\uFEFF${body}` : body;
}
