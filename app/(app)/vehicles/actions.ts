"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { createVehicle } from "@/db/queries/vehicles";
import { runAction, type ActionResult } from "@/lib/auth/action";
import { NewVehicleInput } from "@/lib/vehicle-input";
import { checkVin } from "@/lib/vin";

export async function createVehicleAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("vehicles:write", NewVehicleInput, formData, async (input, auth) => {
    await createVehicle(await getDb(), auth, input);
    revalidatePath("/vehicles");
    const vin = input.vin ? checkVin(input.vin) : null;
    return {
      ok: true,
      message:
        vin && !vin.hasValidCheckDigit
          ? `Vehicle added. Note: ${vin.problems.join(" ")} Required for North American vehicles only.`
          : "Vehicle added.",
    };
  });
}
