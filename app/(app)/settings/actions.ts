"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { updateOrganisationSettings } from "@/db/queries/organisations";
import { DISTANCE_UNITS } from "@/db/schema/organisations";
import { runAction, type ActionResult } from "@/lib/auth/action";

const Settings = z.object({
  name: z.string().trim().min(2, "Give the organisation a name.").max(120),
  distanceUnit: z.enum(DISTANCE_UNITS),
  bandWidth: z.coerce.number().int().min(1000, "At least 1,000.").max(200_000, "At most 200,000."),
  comebackDays: z.coerce.number().int().min(1).max(730),
  comebackDistance: z.coerce.number().int().min(100).max(100_000),
  refuelWindow: z.coerce.number().int().min(1).max(500),
  confidenceLevel: z.coerce.number().refine((v) => [0.8, 0.9, 0.95, 0.99].includes(v), {
    message: "Choose 80%, 90%, 95% or 99%.",
  }),
  minExposure: z.coerce.number().int().min(0).max(10_000_000),
  uploadLimitMb: z.coerce.number().int().min(1).max(2000),
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
