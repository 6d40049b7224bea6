"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { countParts, createPart, deletePart, receiveParts, updatePart } from "@/db/queries/parts";
import { runAction, type ActionResult } from "@/lib/auth/action";
import {
  CountPartsInput,
  DeletePartInput,
  NewPartInput,
  PartUpdateInput,
  ReceivePartsInput,
} from "@/lib/part-input";

/** The parts list feeds the stocking plan: both show the change at once. */
function revalidateParts(partId?: number) {
  revalidatePath("/parts");
  if (partId) revalidatePath(`/parts/${partId}`);
  revalidatePath("/stocking");
}

const count = (n: number) => n.toLocaleString("en-GB");

export async function createPartAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("parts:manage", NewPartInput, formData, async (input, auth) => {
    await createPart(await getDb(), auth, input);
    revalidateParts();
    return { ok: true, message: `Part ${input.partNumber} added.` };
  });
}

export async function updatePartAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("parts:manage", PartUpdateInput, formData, async (input, auth) => {
    await updatePart(await getDb(), auth, input);
    revalidateParts(input.partId);
    return { ok: true, message: "Saved." };
  });
}

export async function receivePartsAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("parts:manage", ReceivePartsInput, formData, async (input, auth) => {
    const after = await receiveParts(await getDb(), auth, input);
    revalidateParts(input.partId);
    return {
      ok: true,
      message: `${count(input.quantity)} received; ${count(after.onHand)} on hand.`,
    };
  });
}

export async function countPartsAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("parts:manage", CountPartsInput, formData, async (input, auth) => {
    await countParts(await getDb(), auth, input);
    revalidateParts(input.partId);
    return { ok: true, message: `Count recorded: ${count(input.onHand)} on hand.` };
  });
}

export async function deletePartAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  const result = await runAction("parts:manage", DeletePartInput, formData, async (input, auth) => {
    await deletePart(await getDb(), auth, input.partId);
    revalidateParts();
  });
  // Outside runAction: redirect() throws, and the part's page no longer exists.
  if (result.ok) redirect("/parts?removed=1");
  return result;
}
