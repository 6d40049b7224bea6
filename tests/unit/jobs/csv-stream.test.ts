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
