import { z } from "zod";

/** Thousands grouped by commas or spaces (plain, no-break or narrow no-break): "25,000", "25 000". */
const GROUPED = /^[+-]?\d{1,3}(?:([, \u00a0\u202f])\d{3})(?:\1\d{3})*(?:\.\d+)?$/;

/**
 * A number as people type it in a form: surrounding spaces ignored, thousands grouped by commas
 * or spaces ("25,000", "25 000") read as 25000. Anything else must be a plain number: "1,5" is
 * not read as 15 (nor as 1.5), so a decimal comma is refused rather than misread. Null when the
 * text is not a number; "" is not a number.
 */
export function parseFormNumber(text: string): number | null {
  const t = text.trim();
  if (t === "") return null;
  const plain = GROUPED.test(t) ? t.replace(/[, \u00a0\u202f]/g, "") : t;
  if (!/^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i.test(plain)) return null;
  const n = Number(plain);
  return Number.isFinite(n) ? n : null;
}

/**
 * A zod number from a form field, read with parseFormNumber: an empty field says `required`,
 * text that is not a number says so, instead of becoming 0 or NaN.
 */
export function formNumber(required = "Enter a number.") {
  return z.preprocess(
    (v) => (typeof v === "string" ? (v.trim() === "" ? undefined : (parseFormNumber(v) ?? v)) : v),
    z.number({
      error: (issue) => (issue.input === undefined ? required : "Enter a number, like 25,000."),
    }),
  );
}
