import { z } from "zod";
import { formNumber, parseFormNumber } from "./form-number";

/**
 * What the parts screens accept (app/(app)/parts). A part number starts with a letter or digit
 * and holds letters, digits, spaces and . _ / - (so no cell of an export can start a formula);
 * quantities are whole numbers; a cost is money typed as people type it ("1,234.50").
 */
const PART_NUMBER = /^[A-Za-z0-9][A-Za-z0-9 ._/-]*$/;

/** Largest quantity on a shelf or in one delivery. */
export const MAX_QUANTITY = 1_000_000;
/** Longest lead time accepted, in days. */
export const MAX_LEAD_DAYS = 365;

/** An empty or all-space field as not given (server actions leave empty fields out already). */
const blankAsUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

const optionalText = (max: number) =>
  z.preprocess(
    blankAsUndefined,
    z.string().trim().max(max, `At most ${max} characters.`).optional(),
  );

const wholeNumber = (min: number, max: number, required: string) =>
  formNumber(required)
    .pipe(z.number().int("A whole number."))
    .pipe(
      z
        .number()
        .min(min, `Not below ${min.toLocaleString("en-GB")}.`)
        .max(max, `At most ${max.toLocaleString("en-GB")}.`),
    );

/** An optional whole number: an empty field is "not given". */
const optionalWhole = (min: number, max: number) =>
  z.preprocess(blankAsUndefined, wholeNumber(min, max, "Enter a number.").optional());

/**
 * A unit cost in integer cents from what was typed: "12.5" → 1250, "1,234.50" → 123450, at most
 * two decimals ("12.345" is refused rather than rounded without a word); empty → not given.
 */
export const CostCents = z.preprocess(
  blankAsUndefined,
  z
    .string()
    .optional()
    .transform((text, ctx) => {
      if (text === undefined) return undefined;
      const value = parseFormNumber(text.replace(/^\s*[$€£]\s*/, ""));
      if (value === null || !/^[^.]*(?:\.\d{0,2})?$/.test(text.trim())) {
        ctx.addIssue({ code: "custom", message: "Enter an amount like 12.50." });
        return z.NEVER;
      }
      if (value < 0 || value >= 1e9) {
        ctx.addIssue({ code: "custom", message: "From 0 to 999,999,999.99." });
        return z.NEVER;
      }
      return Math.round(value * 100);
    }),
);

const PartNumber = z
  .string({ error: "Enter the part number." })
  .trim()
  .min(1, "Enter the part number.")
  .max(40, "At most 40 characters.")
  .regex(PART_NUMBER, "Letters, digits, spaces and . _ / - only, starting with a letter or digit.");

const PartId = z.coerce.number().int().positive();

/** The fields of a part that can change after it is added (the part number is its key). */
const PartDetails = {
  description: z
    .string({ error: "Enter a description." })
    .trim()
    .min(1, "Enter a description.")
    .max(200, "At most 200 characters."),
  /** A component slug from the reference catalogue; empty: none. */
  componentSlug: optionalText(120),
  unitCostCents: CostCents,
  leadTimeDays: optionalWhole(0, MAX_LEAD_DAYS),
};

export const NewPartInput = z.object({
  partNumber: PartNumber,
  ...PartDetails,
  // Blank (the form sends nothing for an empty field): none on the shelf yet.
  onHand: z.preprocess(
    (v) => blankAsUndefined(v) ?? "0",
    wholeNumber(0, MAX_QUANTITY, "Enter a number."),
  ),
});
export type NewPartInput = z.infer<typeof NewPartInput>;

export const PartUpdateInput = z.object({ partId: PartId, ...PartDetails });
export type PartUpdateInput = z.infer<typeof PartUpdateInput>;

/** A delivery: the quantity is added to what is on hand. */
export const ReceivePartsInput = z.object({
  partId: PartId,
  quantity: wholeNumber(1, MAX_QUANTITY, "Enter the quantity received."),
});
export type ReceivePartsInput = z.infer<typeof ReceivePartsInput>;

/** A stock count: what is on the shelf replaces what the list says. */
export const CountPartsInput = z.object({
  partId: PartId,
  onHand: wholeNumber(0, MAX_QUANTITY, "Enter the quantity counted."),
});
export type CountPartsInput = z.infer<typeof CountPartsInput>;

export const DeletePartInput = z.object({
  partId: PartId,
  confirm: z.literal("yes", { error: "Tick the box to confirm." }),
});
