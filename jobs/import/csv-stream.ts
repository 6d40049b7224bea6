import type { Readable } from "node:stream";
import type { Options } from "csv-parse";

/** Longest row read (csv-parse's max_record_size): a longer one is a file error, not a row. */
export const MAX_RECORD_CHARS = 1_000_000;

/**
 * What ends a record, outside quotes: CRLF, LF, or a lone CR. csv-parse otherwise takes the
 * first line ending it sees as the only one, so in a CRLF file a lone CR (or LF) left by a
 * spreadsheet or a copy-paste would join two rows into one without a word. CRLF comes first so
 * that it ends one record, not two. A CR or LF inside a quoted field stays part of the field.
 */
export const RECORD_DELIMITERS = ["\r\n", "\n", "\r"];

/**
 * How an import's file is parsed: jobs/import/read.ts, the head inspection (inspect.ts, so the
 * preview and the import see the same rows) and the import benchmark. Rows may have more or
 * fewer fields than the header: the row reader judges them (lib/import/rows.ts).
 */
export function importParseOptions(delimiter: string): Options {
  return {
    delimiter,
    record_delimiter: RECORD_DELIMITERS,
    bom: true,
    relax_column_count: true,
    // A stray quote inside an unquoted field is kept as text (common in exports).
    relax_quotes: true,
    skip_empty_lines: false,
    max_record_size: MAX_RECORD_CHARS,
  };
}

/**
 * The parser's records in batches of those already parsed: a stream's own async iterator
 * waits on a promise for every record (a million of them in a large file), this only when
 * the parser has nothing ready.
 */
export async function* recordBatches(stream: Readable): AsyncGenerator<string[][]> {
  // Listening for the whole reading: an error the parser emits while no wait is under way
  // (between two reads) would otherwise be an uncaught exception.
  let failure: Error | null = null;
  stream.on("error", (e: Error) => {
    failure ??= e;
  });
  for (;;) {
    if (failure) throw failure;
    if (stream.destroyed) {
      if (stream.errored) throw stream.errored;
      return;
    }
    const batch: string[][] = [];
    let record: string[] | null;
    while ((record = stream.read() as string[] | null) !== null) batch.push(record);
    if (batch.length > 0) {
      yield batch;
      continue;
    }
    if (stream.errored) throw stream.errored;
    if (stream.readableEnded) return;
    await new Promise<void>((resolve) => {
      const done = () => {
        stream.off("readable", done);
        stream.off("end", done);
        stream.off("close", done);
        stream.off("error", done);
        resolve();
      };
      stream.on("readable", done);
      stream.on("end", done);
      stream.on("close", done);
      stream.on("error", done);
    });
  }
}
