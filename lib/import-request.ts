import { z } from "zod";
import { IMPORT_KINDS } from "@/db/schema/operations";

/** Query of an upload: what the file holds and its name. */
export const UploadQuery = z.object({
  kind: z.enum(IMPORT_KINDS, {
    message: `Choose what the file holds: ${IMPORT_KINDS.join(", ")}.`,
  }),
  name: z.string().trim().min(1, "The file needs a name.").max(200),
});

export const ReadOptionsInput = z.object({
  /**
   * The order the user chose. Absent: not chosen, and the file's own order is read; a file
   * whose dates fit both orders cannot start without one (jobs/import/inspect.ts
   * resolveDateFormat).
   */
  dateFormat: z.enum(["iso", "mdy", "dmy"]).optional(),
  decimalSeparator: z.enum([".", ","]),
  distanceUnit: z.enum(["mi", "km"]),
  volumeUnit: z.enum(["l", "us-gal", "imp-gal"]),
});

/** The mapping screen's choice: canonical column → header name (or null for "not in file"). */
export const MappingInput = z.object({
  mapping: z.record(z.string().max(60), z.string().max(300).nullable()),
  read: ReadOptionsInput,
});
export type MappingInput = z.infer<typeof MappingInput>;

export const ImportIdParams = z.object({ id: z.coerce.number().int().positive() });
