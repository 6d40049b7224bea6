"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { changeStateAction, commentAction, watchAction } from "@/app/(app)/known-issues/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { fetchJson } from "@/components/ui/fetch-json";
import { ActionMessage } from "@/components/ui/action-message";
import { useFormAction } from "@/components/ui/use-form-action";

/** Moves the known issue to one of the states allowed from here, with the reason. */
export function StateChangeForm({
  knownIssueId,
  options,
}: {
  knownIssueId: number;
  options: { value: string; label: string }[];
}) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(changeStateAction, {
    resetOnSuccess: true,
  });
  return (
    <form ref={formRef} onSubmit={onSubmit} className="mt-3 space-y-2" aria-label="Change state">
      <input type="hidden" name="knownIssueId" value={knownIssueId} />
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Move to</span>
        <select name="toState" className={inputClass} defaultValue={options[0]?.value}>
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Why</span>
        <textarea
          name="reason"
          rows={2}
          className={inputClass}
          aria-invalid={fieldErrors?.reason ? true : undefined}
        />
        {fieldErrors?.reason ? (
          <span className="mt-1 block text-alarm-700">{fieldErrors.reason.join(" ")}</span>
        ) : null}
      </label>
      <button type="submit" className={buttonClass.primary} disabled={isPending}>
        {isPending ? "Saving…" : "Change state"}
      </button>
      <ActionMessage state={state} />
    </form>
  );
}

export function CommentForm({ knownIssueId }: { knownIssueId: number }) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(commentAction, {
    resetOnSuccess: true,
  });
  return (
    <form ref={formRef} onSubmit={onSubmit} className="mt-4 space-y-2" aria-label="Add a comment">
      <input type="hidden" name="knownIssueId" value={knownIssueId} />
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Comment</span>
        <textarea name="body" rows={3} className={inputClass} />
        {fieldErrors?.body ? (
          <span className="mt-1 block text-alarm-700">{fieldErrors.body.join(" ")}</span>
        ) : null}
      </label>
      <button type="submit" className={buttonClass.secondary} disabled={isPending}>
        {isPending ? "Adding…" : "Add comment"}
      </button>
      <ActionMessage state={state} />
    </form>
  );
}

export function WatchButton({
  knownIssueId,
  isWatching,
}: {
  knownIssueId: number;
  isWatching: boolean;
}) {
  const { state, isPending, onSubmit } = useFormAction(watchAction);
  return (
    <form onSubmit={onSubmit} className="flex items-center gap-2">
      <input type="hidden" name="knownIssueId" value={knownIssueId} />
      <input type="hidden" name="watch" value={isWatching ? "0" : "1"} />
      <button type="submit" className={buttonClass.secondary} disabled={isPending}>
        {isWatching ? "Stop watching" : "Watch (e-mail me)"}
      </button>
      {state && !state.ok ? <ActionMessage state={state} /> : null}
    </form>
  );
}

/** Uploads a photo of a failed part (images only; the server checks the type and size). */
export function AttachmentUpload({ knownIssueId, maxMb }: { knownIssueId: number; maxMb: number }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const onChange = async (e: React.ChangeEvent<HTMLInputElement>) => {
    const file = e.currentTarget.files?.[0];
    e.currentTarget.value = "";
    if (!file) return;
    setBusy(true);
    setMessage(null);
    try {
      await fetchJson(
        `/api/known-issues/${knownIssueId}/attachments?name=${encodeURIComponent(file.name)}`,
        { method: "PUT", body: file },
      );
      setMessage({ ok: true, text: `${file.name} attached.` });
      router.refresh();
    } catch (err) {
      setMessage({ ok: false, text: err instanceof Error ? err.message : "The upload failed." });
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="mt-3 text-sm">
      <label className={`${buttonClass.secondary} cursor-pointer`}>
        {busy ? "Uploading…" : "Attach a photo"}
        <input
          type="file"
          accept="image/jpeg,image/png,image/webp,image/gif"
          className="sr-only"
          onChange={(e) => void onChange(e)}
          disabled={busy}
        />
      </label>
      <span className="ml-3 text-ink-soft">JPEG, PNG, WebP or GIF, up to {maxMb} MB.</span>
      {message ? (
        <p
          role={message.ok ? "status" : "alert"}
          className={message.ok ? "mt-2 text-ok-700" : "mt-2 text-alarm-700"}
        >
          {message.text}
        </p>
      ) : null}
    </div>
  );
}
