/**
 * SQL text for bulk inserts. Staging writes send many rows per statement as literals rather
 * than bound parameters: the libSQL client prepares every statement afresh, and a statement
 * with tens of thousands of parameters costs more to prepare (and holds native memory until
 * garbage collection) than the database takes to parse literal values.
 *
 * Safety rests on this one function: numbers must be finite, text is quoted with doubled
 * single quotes (SQLite has no backslash escapes), NUL characters are dropped (they cannot
 * travel in SQL text), and nothing else is accepted.
 */
export type SqlValue = string | number | boolean | null | undefined;

const IDENTIFIER = /^[a-z_][a-z0-9_]*$/;

export function sqlLiteral(value: SqlValue): string {
  if (value === null || value === undefined) return "NULL";
  if (typeof value === "boolean") return value ? "1" : "0";
  if (typeof value === "number") {
    if (!Number.isFinite(value)) throw new Error(`sqlLiteral: ${value} cannot be stored`);
    return String(value);
  }
  if (typeof value !== "string") throw new Error("sqlLiteral: unsupported value");
  // Most cells need no escaping: skip the two replacements for them (millions of calls).
  if (value.indexOf("'") === -1 && value.indexOf("\u0000") === -1) return `'${value}'`;
  return `'${value.replaceAll("\u0000", "").replaceAll("'", "''")}'`;
}

/** A whole number written into SQL text (an id, a count): a safe integer of at least `min`. */
export function sqlInt(n: number, min = 0): number {
  if (!Number.isSafeInteger(n) || n < min)
    throw new Error(`SQL text: ${n} is not a valid number here`);
  return n;
}

/** INSERT statements for rows (arrays in the order of columns), at most rowsPerStatement each. */
export function insertStatements(
  table: string,
  columns: readonly string[],
  rows: readonly SqlValue[][],
  rowsPerStatement = 500,
): string[] {
  if (!IDENTIFIER.test(table) || columns.some((c) => !IDENTIFIER.test(c))) {
    throw new Error("insertStatements: table and column names must be plain identifiers");
  }
  const head = `insert into ${table} (${columns.join(", ")}) values `;
  const out: string[] = [];
  for (let i = 0; i < rows.length; i += rowsPerStatement) {
    let sql = head;
    const end = Math.min(rows.length, i + rowsPerStatement);
    for (let r = i; r < end; r++) {
      const row = rows[r] as SqlValue[];
      if (row.length !== columns.length)
        throw new Error("insertStatements: row length differs from columns");
      let tuple = r === i ? "(" : ",(";
      for (let c = 0; c < row.length; c++) tuple += (c === 0 ? "" : ",") + sqlLiteral(row[c]);
      sql += `${tuple})`;
    }
    out.push(sql);
  }
  return out;
}
