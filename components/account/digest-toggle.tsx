"use client";

import { digestOptInAction } from "@/app/(app)/account/actions";
import { buttonClass } from "@/components/ui/button";
import { useFormAction } from "@/components/ui/use-form-action";

export function DigestToggle({ wants }: { wants: boolean }) {
  const { state, isPending, onSubmit } = useFormAction(digestOptInAction);
  return (
    <form
      onSubmit={onSubmit}
      className="mt-3 flex items-center gap-3 text-sm"
      aria-label="Weekly digest"
    >
      <input type="hidden" name="wantsDigest" value={wants ? "0" : "1"} />
      <span data-testid="digest-state">
        {wants ? "You get the digest." : "You do not get the digest."}
      </span>
      <button type="submit" className={buttonClass.secondary} disabled={isPending}>
        {wants ? "Stop the digest" : "Send me the digest"}
      </button>
      {state ? (
        <span
          role={state.ok ? "status" : "alert"}
          className={state.ok ? "text-ok-700" : "text-alarm-700"}
        >
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
