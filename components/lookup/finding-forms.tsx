"use client";

import { useActionState } from "react";
import { recordFindingAction } from "@/app/(app)/lookup/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { useFormAction } from "@/components/ui/use-form-action";
import type { ActionResult } from "@/lib/auth/action";

/** What every finding from this lookup carries: the vehicle, odometer, codes and complaint. */
export type FindingContext = {
  vehicleId: number;
  odometer?: number;
  dtcCodes: string;
  symptom?: string;
  complaint?: string;
};

function ContextFields({ context }: { context: FindingContext }) {
  return (
    <>
      <input type="hidden" name="vehicleId" value={context.vehicleId} />
      {context.odometer !== undefined ? (
        <input type="hidden" name="odometer" value={context.odometer} />
      ) : null}
      <input type="hidden" name="dtcCodes" value={context.dtcCodes} />
      {context.symptom ? <input type="hidden" name="symptom" value={context.symptom} /> : null}
      {context.complaint ? (
        <input type="hidden" name="complaint" value={context.complaint} />
      ) : null}
    </>
  );
}

function Outcome({ state }: { state: ActionResult | null }) {
  if (!state) return null;
  return (
    <p
      role={state.ok ? "status" : "alert"}
      className={`mt-2 rounded-md px-3 py-2 text-sm ${state.ok ? "bg-ok-100 text-ok-700" : "bg-alarm-100 text-alarm-700"}`}
    >
      {state.ok
        ? (state.message ?? "Recorded.")
        : [
            state.message,
            ...Object.entries(state.fieldErrors ?? {})
              .filter(([field]) => field !== "cause")
              .flatMap(([, messages]) => messages ?? []),
          ].join(" ")}
    </p>
  );
}

/** One click per outcome for one cause of the lookup; `fields` says which cause it is. */
function CauseFindingForm({
  context,
  title,
  fields,
  outcomes,
}: {
  context: FindingContext;
  title: string;
  fields: Record<string, string | number>;
  outcomes: { value: string; label: string }[];
}) {
  const [state, formAction, isPending] = useActionState<ActionResult | null, FormData>(
    recordFindingAction,
    null,
  );
  return (
    <form action={formAction} aria-label={`Record a finding: ${title}`} className="no-print mt-4">
      <ContextFields context={context} />
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      <div className="flex flex-wrap items-center gap-2">
        <span className="text-sm font-medium">What did you find?</span>
        {outcomes.map((o, i) => (
          <button
            key={o.value}
            type="submit"
            name="outcome"
            value={o.value}
            disabled={isPending || state?.ok === true}
            className={i === 0 ? buttonClass.primary : buttonClass.secondary}
          >
            {o.label}
          </button>
        ))}
      </div>
      <Outcome state={state} />
    </form>
  );
}

/** "This was the cause" / "Not the cause" for one known issue: one click each. */
export function KnownIssueFindingForm({
  context,
  knownIssueId,
  title,
}: {
  context: FindingContext;
  knownIssueId: number;
  title: string;
}) {
  return (
    <CauseFindingForm
      context={context}
      title={title}
      fields={{ knownIssueId }}
      outcomes={[
        { value: "confirmed", label: "This was the cause" },
        { value: "not-the-cause", label: "Not the cause" },
      ]}
    />
  );
}

/**
 * "This was the cause" for a computed pattern (a component, no known issue): the finding's
 * repair line is recorded as fixed at that component, with the fix the records show.
 */
export function ComponentFindingForm({
  context,
  componentSlug,
  title,
  correction,
}: {
  context: FindingContext;
  componentSlug: string;
  title: string;
  correction: string | null;
}) {
  return (
    <CauseFindingForm
      context={context}
      title={title}
      fields={{
        componentSlug,
        cause: title.slice(0, 2000),
        ...(correction ? { correction: correction.slice(0, 2000) } : {}),
      }}
      outcomes={[{ value: "something-else", label: "This was the cause" }]}
    />
  );
}

/** "Something else": the cause and correction in the technician's words. */
export function SomethingElseForm({ context }: { context: FindingContext }) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(recordFindingAction, {
    resetOnSuccess: true,
  });
  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      aria-label="Record something else"
      className="no-print space-y-3"
    >
      <ContextFields context={context} />
      <input type="hidden" name="outcome" value="something-else" />
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Cause (what you found)</span>
        <textarea
          name="cause"
          rows={2}
          maxLength={2000}
          aria-invalid={fieldErrors?.cause ? true : undefined}
          aria-describedby={fieldErrors?.cause ? "cause-error" : undefined}
          className={inputClass}
        />
        {fieldErrors?.cause ? (
          <span id="cause-error" className="mt-1 block text-alarm-700">
            {fieldErrors.cause.join(" ")}
          </span>
        ) : null}
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Correction (what you did)</span>
        <textarea name="correction" rows={2} maxLength={2000} className={inputClass} />
      </label>
      <button type="submit" disabled={isPending} className={buttonClass.secondary}>
        Record something else
      </button>
      <Outcome state={state} />
    </form>
  );
}
