"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { updateOrganisationSettings } from "@/db/queries/organisations";
import { DISTANCE_UNITS } from "@/db/schema/organisations";
import { runAction, type ActionResult } from "@/lib/auth/action";
import { formNumber } from "@/lib/form-number";

// Numbers as people type them: "25,000" and "25 000" read as 25000; an empty field is an error,
// not 0 (lib/form-number.ts).
const whole = (required: string, min: number, max: number) =>
  formNumber(required).pipe(
    z
      .number()
      .int("Use a whole number.")
      .min(min, `At least ${min.toLocaleString("en-GB")}.`)
      .max(max, `At most ${max.toLocaleString("en-GB")}.`),
  );

const Settings = z.object({
  name: z.string().trim().min(2, "Give the organisation a name.").max(120),
  distanceUnit: z.enum(DISTANCE_UNITS),
  bandWidth: whole("Give the mileage band width.", 1000, 200_000),
  comebackDays: whole("Give the comeback window in days.", 1, 730),
  comebackDistance: whole("Give the comeback distance.", 100, 100_000),
  refuelWindow: whole("Give the refuel window.", 1, 500),
  confidenceLevel: z.coerce.number().refine((v) => [0.8, 0.9, 0.95, 0.99].includes(v), {
    message: "Choose 80%, 90%, 95% or 99%.",
  }),
  minExposure: whole("Give the least exposure.", 0, 10_000_000),
  uploadLimitMb: whole("Give the upload limit in MB.", 1, 2000),
});

export async function updateSettingsAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("settings:manage", Settings, formData, async (input, auth) => {
    const { isRecomputing } = await updateOrganisationSettings(await getDb(), auth, input);
    revalidatePath("/", "layout");
    return {
      ok: true,
      message: isRecomputing
        ? "Settings saved. The statistics are being recomputed with them."
        : "Settings saved.",
    };
  });
}
