"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { addToCampaign, setCampaignVehicleDone } from "@/db/queries/campaigns";
import { runAction, type ActionResult } from "@/lib/auth/action";

/** The form sends one checkbox per vehicle (`vehicle:<id>`), and an existing list or a new name. */
const AddToCampaign = z
  .object({
    campaignId: z.coerce.number().int().positive().optional(),
    name: z.string().trim().min(3, "Name the list (at least 3 characters).").max(120).optional(),
  })
  .catchall(z.unknown())
  .transform((f, ctx) => {
    const vehicleIds = Object.keys(f)
      .filter((k) => k.startsWith("vehicle:") && f[k] !== undefined)
      .map((k) => Number(k.slice(8)))
      .filter((n) => Number.isInteger(n) && n > 0);
    if (vehicleIds.length === 0) {
      ctx.addIssue({ code: "custom", path: ["vehicles"], message: "Tick at least one vehicle." });
    }
    if (f.campaignId === undefined && !f.name) {
      ctx.addIssue({ code: "custom", path: ["name"], message: "Choose a list or name a new one." });
    }
    return { campaignId: f.campaignId, name: f.name, vehicleIds };
  });

export async function addToCampaignAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("campaigns:manage", AddToCampaign, formData, async (input, auth) => {
    const { added, campaignId } = await addToCampaign(await getDb(), auth, input);
    revalidatePath("/at-risk");
    revalidatePath(`/campaigns/${campaignId}`);
    return { ok: true, message: `${added} vehicle${added === 1 ? "" : "s"} added to the list.` };
  });
}

const Done = z.object({
  campaignVehicleId: z.coerce.number().int().positive(),
  done: z.enum(["1", "0"]),
  campaignId: z.coerce.number().int().positive(),
});

export async function setDoneAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("campaigns:manage", Done, formData, async (input, auth) => {
    await setCampaignVehicleDone(await getDb(), auth, {
      campaignVehicleId: input.campaignVehicleId,
      done: input.done === "1",
    });
    revalidatePath(`/campaigns/${input.campaignId}`);
    revalidatePath("/at-risk");
  });
}
