import { Readable } from "node:stream";
import { parse } from "csv-parse";
import { parse as parseSync } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { importParseOptions, recordBatches } from "@/jobs/import/csv-stream";

/** A file's bytes in small pieces, as a read stream gives them. */
function source(text: string, piece = 7): Readable {
  const bytes = Buffer.from(text);
  const pieces: Buffer[] = [];
  for (let i = 0; i < bytes.length; i += piece) pieces.push(bytes.subarray(i, i + piece));
  return Readable.from(pieces);
}

async function readAll(text: string): Promise<{ records: string[][]; batches: number }> {
  const records: string[][] = [];
  let batches = 0;
  for await (const batch of recordBatches(source(text).pipe(parse(importParseOptions(","))))) {
    expect(batch.length).toBeGreaterThan(0);
    batches++;
    records.push(...batch);
  }
  return { records, batches };
}

describe("recordBatches", () => {
  it("gives every record csv-parse reads, in order, in batches", async () => {
    const rows = Array.from(
      { length: 2_000 },
      (_, i) => `RO-${i},"Stalls, then ""restarts""",${i % 7 === 0 ? '"two\nlines"' : ""}`,
    );
    const text = `\ufeffro_number,complaint,note\r\n${rows.join("\r\n")}\r\n`;
    const { records, batches } = await readAll(text);
    // csv-parse's own whole-text reading, with the same options, is the reference.
    expect(records).toEqual(parseSync(text, importParseOptions(",")));
    expect(records).toHaveLength(2_001);
    expect(records[1]).toEqual(["RO-0", 'Stalls, then "restarts"', "two\nlines"]);
    expect(batches).toBeLessThan(records.length);
  });

  it("ends with the parser's error (an unterminated quote)", async () => {
    await expect(readAll('a,b\n1,"never closed\n2,3\n')).rejects.toMatchObject({
      code: "CSV_QUOTE_NOT_CLOSED",
    });
  });

  it("ends quietly when the parser is destroyed (a cancel)", async () => {
    const text = Array.from({ length: 5_000 }, (_, i) => `${i},x`).join("\n");
    const parser = source(text, 64).pipe(parse(importParseOptions(",")));
    const seen: string[][] = [];
    for await (const batch of recordBatches(parser)) {
      seen.push(...batch);
      parser.destroy();
    }
    expect(seen.length).toBeGreaterThan(0);
    expect(seen.length).toBeLessThan(5_000);
  });
});

describe("line endings", () => {
  // RFC 4180 ends records with CRLF; files also come with LF, and a lone CR slips into CRLF
  // files (common practice). Recurra's rule: each of the three ends a record outside quotes.
  const read = async (text: string, piece: number) => {
    const records: string[][] = [];
    const parser = source(text, piece).pipe(parse(importParseOptions(",")));
    for await (const batch of recordBatches(parser)) records.push(...batch);
    return records;
  };

  it("a lone CR between two rows of a CRLF file ends a record: two rows, not one", async () => {
    const text = "unit,odometer\r\nU-1,41000\rU-2,52000\r\n";
    // One byte at a time too: a CR at the end of a piece may be the first half of a CRLF.
    for (const piece of [1, 7, 1024]) {
      expect(await read(text, piece)).toEqual([
        ["unit", "odometer"],
        ["U-1", "41000"],
        ["U-2", "52000"],
      ]);
    }
  });

  it("CRLF ends one record, not two; a lone LF ends one too; CR and LF inside quotes stay", async () => {
    const text = 'a,b\r\n1,"x\ry"\n2,"p\r\nq"\r\n3,4';
    expect(await read(text, 3)).toEqual([
      ["a", "b"],
      ["1", "x\ry"],
      ["2", "p\r\nq"],
      ["3", "4"],
    ]);
  });
});
