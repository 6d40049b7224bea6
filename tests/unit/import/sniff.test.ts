import { describe, expect, test } from "vitest";

import {
  checkCsvBytes,
  isValidUtf8,
  looksBinary,
  sniffDelimiter,
  stripBom,
} from "@/lib/import/sniff";

// Sources: "Unicode" (the byte-order mark U+FEFF; UTF-8 well-formedness, Unicode §3.9);
// file signatures ("common practice": ZIP PK\x03\x04, PDF %PDF, OLE2 D0 CF 11 E0); the rest is
// "Recurra's rule".

const bytes = (text: string) => new TextEncoder().encode(text);

describe("stripBom", () => {
  test("removes one leading byte-order mark only", () => {
    // Unicode
    expect(stripBom("\uFEFFRO,Date")).toBe("RO,Date");
    expect(stripBom("RO,Date")).toBe("RO,Date");
    expect(stripBom("a\uFEFF")).toBe("a\uFEFF");
  });
});

describe("sniffDelimiter", () => {
  test("comma, semicolon and tab files", () => {
    // common practice
    expect(sniffDelimiter("RO,Date,Unit\n1,2024-01-01,U1\n")).toBe(",");
    expect(sniffDelimiter("RO;Date;Cost\n1;01.02.2024;12,50\n2;02.02.2024;3,10\n")).toBe(";");
    expect(sniffDelimiter("RO\tDate\tNote\n1\t2024-01-01\ta, b\n")).toBe("\t");
  });

  test("delimiters inside quotes do not count, even across lines", () => {
    // RFC 4180 quoting
    const text = 'RO;Complaint;Unit\n1;"stalls, then dies; twice";U1\n2;"a\nb, c";U2\n';
    expect(sniffDelimiter(text)).toBe(";");
  });

  test("a cut-off last line does not decide; a one-column file is comma", () => {
    // Recurra's rule
    expect(sniffDelimiter("a;b;c\n1;2;3\n4;5")).toBe(";");
    expect(sniffDelimiter("\uFEFFRO\n1\n2\n")).toBe(",");
  });
});

describe("looksBinary and isValidUtf8", () => {
  test("text is not binary; NUL bytes and control characters are", () => {
    // Recurra's rule (NUL, or more than 10% control characters)
    expect(looksBinary(bytes("RO,Date\r\n1,2024-01-01\r\n"))).toBe(false);
    expect(looksBinary(new Uint8Array([0x52, 0x00, 0x4f]))).toBe(true);
    expect(looksBinary(new Uint8Array([1, 2, 3, 4, 65, 66, 67]))).toBe(true);
    expect(looksBinary(new Uint8Array([65, 66, 67, 68, 69, 70, 71, 72, 73, 74, 1]))).toBe(false);
    expect(looksBinary(new Uint8Array([]))).toBe(false);
  });

  test("UTF-8 well-formedness", () => {
    // Unicode §3.9: 0xE9 alone (Latin-1 "é") is not UTF-8; C3 A9 is
    expect(isValidUtf8(bytes("Kilomètres"))).toBe(true);
    expect(isValidUtf8(new Uint8Array([0x4b, 0x69, 0x6c, 0x6f, 0x6d, 0xe8, 0x74]))).toBe(false);
    expect(isValidUtf8(new Uint8Array([0xc3]))).toBe(false);
  });
});

describe("checkCsvBytes", () => {
  test("accepts UTF-8 text, refuses the usual wrong files with a clear message", () => {
    // common practice (file signatures); messages are Recurra's own
    expect(checkCsvBytes(bytes("RO,Date\n"))).toEqual({ ok: true });
    const refusal = (b: Uint8Array) => {
      const r = checkCsvBytes(b);
      return r.ok ? "" : r.message;
    };
    expect(refusal(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2]))).toMatch(/workbook/);
    expect(refusal(new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1]))).toMatch(/\.xls/);
    expect(refusal(bytes("%PDF-1.7\n"))).toMatch(/PDF/);
    expect(refusal(new Uint8Array([0xff, 0xfe, 0x52, 0x00]))).toMatch(/UTF-16/);
    expect(refusal(new Uint8Array([0x52, 0x4f, 0xe9, 0x0a]))).toMatch(/not UTF-8/);
    expect(refusal(new Uint8Array([0x00, 0x01, 0x02]))).toMatch(/not text/);
    expect(refusal(new Uint8Array([]))).toMatch(/empty/);
  });
});
