"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { setComponentKind } from "@/db/queries/component-kinds";
import { COMPONENT_KINDS, KIND_LABELS } from "@/lib/component-kinds";
import { runAction, type ActionResult } from "@/lib/auth/action";

const ComponentKindInput = z.object({
  slug: z.string().trim().min(1).max(120),
  kind: z.enum(COMPONENT_KINDS, { message: "Choose scheduled service, wear or failure." }),
});

export async function setComponentKindAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("settings:manage", ComponentKindInput, formData, async (input, auth) => {
    const result = await setComponentKind(await getDb(), auth, input.slug, input.kind);
    revalidatePath("/", "layout");
    if (!result.isChanged)
      return { ok: true, message: `Already ${KIND_LABELS[input.kind].toLowerCase()}.` };
    const kind = KIND_LABELS[input.kind].toLowerCase();
    if (result.linesChanged === 0)
      return { ok: true, message: `Saved as ${kind}. None of your repair lines changed kind.` };
    return {
      ok: true,
      message: `Saved as ${kind}: ${result.linesChanged} repair ${
        result.linesChanged === 1 ? "line" : "lines"
      } classified again; the statistics are being recomputed.`,
    };
  });
}
