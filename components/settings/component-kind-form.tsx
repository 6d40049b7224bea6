"use client";

import { setComponentKindAction } from "@/app/(app)/settings/components/actions";
import { buttonClass } from "@/components/ui/button";
import { useFormAction } from "@/components/ui/use-form-action";
import { COMPONENT_KINDS, KIND_LABELS, type ComponentKind } from "@/lib/component-kinds";

/** One component's kind for the organisation: a choice of the three and a save button. */
export function ComponentKindForm({
  slug,
  name,
  kind,
}: {
  slug: string;
  name: string;
  kind: ComponentKind;
}) {
  const { state, isPending, formRef, onSubmit } = useFormAction(setComponentKindAction);
  return (
    <form ref={formRef} onSubmit={onSubmit} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="slug" value={slug} />
      <select
        name="kind"
        defaultValue={kind}
        aria-label={`Kind of ${name}`}
        className="min-h-11 rounded-md border border-line-strong bg-white px-2 py-1 text-sm"
      >
        {COMPONENT_KINDS.map((k) => (
          <option key={k} value={k}>
            {KIND_LABELS[k]}
          </option>
        ))}
      </select>
      <button
        type="submit"
        className={`${buttonClass.quiet} min-h-11 border border-line`}
        disabled={isPending}
      >
        Save
      </button>
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
