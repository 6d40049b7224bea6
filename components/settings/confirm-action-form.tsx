"use client";

import { useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { useFormAction } from "@/components/ui/use-form-action";
import type { ActionResult } from "@/lib/auth/action";

type FormAction = (prev: ActionResult | null, formData: FormData) => Promise<ActionResult>;

/**
 * A one-button form for a change that cannot be undone (remove a member, revoke an invitation):
 * the first press asks, the second does it.
 */
export function ConfirmActionForm({
  action,
  fields,
  label,
  accessibleLabel,
  question,
}: {
  action: FormAction;
  fields: Record<string, string | number>;
  label: string;
  accessibleLabel: string;
  question: string;
}) {
  const { state, isPending, formRef, onSubmit } = useFormAction(action);
  const [isAsking, setAsking] = useState(false);
  return (
    <form
      ref={formRef}
      onSubmit={(e) => {
        setAsking(false);
        onSubmit(e);
      }}
      className="flex flex-wrap items-center gap-2"
    >
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      {isAsking ? (
        <>
          <span className="text-sm">{question}</span>
          <button
            type="submit"
            className={`${buttonClass.quiet} border border-alarm-700 text-alarm-700`}
            disabled={isPending}
          >
            Yes, {label.toLowerCase()}
          </button>
          <button
            type="button"
            className={buttonClass.quiet}
            onClick={() => setAsking(false)}
            disabled={isPending}
          >
            Cancel
          </button>
        </>
      ) : (
        <button
          type="button"
          aria-label={accessibleLabel}
          className={`${buttonClass.quiet} border border-line`}
          onClick={() => setAsking(true)}
          disabled={isPending}
        >
          {label}
        </button>
      )}
      {state ? (
        <span
          role={state.ok ? "status" : "alert"}
          className={`text-sm ${state.ok ? "text-ok-700" : "text-alarm-700"}`}
        >
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
