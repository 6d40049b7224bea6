"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { getDb } from "@/db";
import {
  addKnownIssueComment,
  changeKnownIssueState,
  createKnownIssue,
  setWatching,
  updateKnownIssue,
} from "@/db/queries/known-issues";
import { runAction, type ActionResult } from "@/lib/auth/action";
import { CommentForm, KnownIssueForm, StateChangeForm } from "@/lib/known-issues";

export async function createKnownIssueAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  let createdId: number | null = null;
  const result = await runAction(
    "known-issues:manage",
    KnownIssueForm,
    formData,
    async (input, auth) => {
      createdId = (await createKnownIssue(await getDb(), auth, input)).id;
      revalidatePath("/known-issues");
    },
  );
  // Outside runAction: redirect() works by throwing, which runAction would rethrow anyway.
  if (result.ok && createdId !== null) redirect(`/known-issues/${createdId}`);
  return result;
}

const Id = z.object({ knownIssueId: z.coerce.number().int().positive() });

export async function updateKnownIssueAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  const id = Id.safeParse({ knownIssueId: formData.get("knownIssueId") });
  if (!id.success) return { ok: false, message: "Unknown known issue." };
  const result = await runAction(
    "known-issues:manage",
    KnownIssueForm,
    formData,
    async (input, auth) => {
      await updateKnownIssue(await getDb(), auth, id.data.knownIssueId, input);
      revalidatePath("/known-issues", "layout");
    },
  );
  if (result.ok) redirect(`/known-issues/${id.data.knownIssueId}`);
  return result;
}

export async function changeStateAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("known-issues:manage", StateChangeForm, formData, async (input, auth) => {
    await changeKnownIssueState(await getDb(), auth, input);
    revalidatePath("/known-issues", "layout");
    return { ok: true, message: "State changed; watchers are told by e-mail." };
  });
}

export async function commentAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("known-issues:comment", CommentForm, formData, async (input, auth) => {
    await addKnownIssueComment(await getDb(), auth, input);
    revalidatePath(`/known-issues/${input.knownIssueId}`);
    return { ok: true, message: "Comment added." };
  });
}

const Watch = Id.extend({ watch: z.enum(["1", "0"]) });

export async function watchAction(
  _prev: ActionResult | null,
  formData: FormData,
): Promise<ActionResult> {
  return runAction("known-issues:comment", Watch, formData, async (input, auth) => {
    await setWatching(await getDb(), auth, input.knownIssueId, input.watch === "1");
    revalidatePath(`/known-issues/${input.knownIssueId}`);
    return {
      ok: true,
      message: input.watch === "1" ? "You watch this known issue." : "You no longer watch it.",
    };
  });
}
