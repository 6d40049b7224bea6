"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { recordFinding } from "@/db/queries/lookup";
import { runAction, type ActionResult } from "@/lib/auth/action";
import { FindingForm } from "@/lib/known-issues";

const OUTCOME_WORDS = {
  confirmed: "this was the cause",
  "not-the-cause": "not the cause",
  "something-else": "something else was the cause",
} as const;

/** Records a technician's finding from a lookup result (findings:record). */
export async function recordFindingAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("findings:record", FindingForm, formData, async (input, auth) => {
    const result = await recordFinding(await getDb(), auth, input);
    revalidatePath("/lookup");
    if (input.knownIssueId !== undefined) revalidatePath(`/known-issues/${input.knownIssueId}`);
    return {
      ok: true,
      message: `Recorded: ${input.componentSlug ? `this was the cause (${input.cause ?? input.componentSlug})` : OUTCOME_WORDS[input.outcome]}. Repair order ${result.roNumber} is now on the vehicle's record; the statistics will be recomputed shortly.${result.emailed > 0 ? ` ${result.emailed} watcher${result.emailed === 1 ? "" : "s"} will hear about it by e-mail.` : ""}`,
    };
  });
}
