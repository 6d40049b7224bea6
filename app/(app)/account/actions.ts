"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db";
import { setDigestOptIn } from "@/db/queries/preferences";
import { runAction, type ActionResult } from "@/lib/auth/action";

const Digest = z.object({ wantsDigest: z.enum(["1", "0"]) });

export async function digestOptInAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("dashboard:read", Digest, formData, async (input, auth) => {
    await setDigestOptIn(await getDb(), auth, input.wantsDigest === "1");
    revalidatePath("/account");
    return {
      ok: true,
      message: input.wantsDigest === "1" ? "You will get the weekly digest." : "No more digests.",
    };
  });
}
