"use client";

import { buttonClass, inputClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { useFormAction } from "@/components/ui/use-form-action";
import type { ActionResult } from "@/lib/auth/action";

/** What the form starts with: empty for a new issue, prefilled from a cell, or the issue itself. */
export type KnownIssueFormValues = {
  knownIssueId?: number;
  title: string;
  summary: string;
  mileageFrom: string;
  mileageTo: string;
  dtcCodes: string;
  componentSlug: string;
  checks: string;
  fixDescription: string;
  laborOperation: string;
  typicalHours: string;
  parts: string;
  cautionText: string;
  references: string;
  signalId?: number;
  /** Checked boxes: "cohort:<make>|<model>|<generationId or *>", "symptom:<slug>", "caution:<kind>". */
  checked: string[];
};

export type KnownIssueFormChoices = {
  unit: "mi" | "km";
  cohorts: { make: string; model: string; options: { key: string; label: string }[] }[];
  symptoms: { slug: string; label: string }[];
  cautions: { kind: string; title: string; text: string }[];
  components: { system: string; items: { slug: string; name: string }[] }[];
};

function ErrorText({ id, errors }: { id: string; errors?: string[] }) {
  return errors?.length ? (
    <p id={id} className="mt-1 text-sm text-alarm-700">
      {errors.join(" ")}
    </p>
  ) : null;
}

function TextArea({
  name,
  label,
  hint,
  rows = 3,
  defaultValue,
  errors,
}: {
  name: string;
  label: string;
  hint?: string;
  rows?: number;
  defaultValue: string;
  errors?: string[];
}) {
  return (
    <label className="block text-sm">
      <span className="mb-1 block font-medium">{label}</span>
      <textarea
        name={name}
        rows={rows}
        defaultValue={defaultValue}
        className={inputClass}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={errors?.length ? `${name}-error` : undefined}
      />
      {hint ? <span className="mt-1 block text-ink-soft">{hint}</span> : null}
      <ErrorText id={`${name}-error`} errors={errors} />
    </label>
  );
}

export function KnownIssueForm({
  action,
  values,
  choices,
  submitLabel,
}: {
  action: (prev: ActionResult | null, formData: FormData) => Promise<ActionResult>;
  values: KnownIssueFormValues;
  choices: KnownIssueFormChoices;
  submitLabel: string;
}) {
  const { state, isPending, formRef, onSubmit, fieldErrors: errors } = useFormAction(action);
  const isChecked = (key: string) => values.checked.includes(key);
  return (
    <form ref={formRef} onSubmit={onSubmit} className="space-y-6" aria-label="Known issue">
      {values.knownIssueId ? (
        <input type="hidden" name="knownIssueId" value={values.knownIssueId} />
      ) : null}
      {values.signalId ? <input type="hidden" name="signalId" value={values.signalId} /> : null}
      <div className="grid gap-4 md:grid-cols-2">
        <Field
          name="title"
          label="Title"
          required
          defaultValue={values.title}
          errors={errors?.title}
        />
        <Field
          name="references"
          label="References (bulletin, recall or internal note numbers)"
          defaultValue={values.references}
        />
      </div>
      <TextArea name="summary" label="What happens and why" defaultValue={values.summary} />

      <fieldset aria-describedby="cohorts-error">
        <legend className="mb-2 text-sm font-medium">Affected cohorts</legend>
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {choices.cohorts.map((c) => (
            <div key={`${c.make} ${c.model}`} className="rounded-md border border-line p-3 text-sm">
              <p className="font-medium">
                {c.make} {c.model}
              </p>
              {c.options.map((o) => (
                <label key={o.key} className="mt-1 flex items-center gap-2">
                  <input type="checkbox" name={o.key} defaultChecked={isChecked(o.key)} />
                  {o.label}
                </label>
              ))}
            </div>
          ))}
        </div>
        <ErrorText id="cohorts-error" errors={errors?.cohorts} />
      </fieldset>

      <div className="grid gap-4 sm:grid-cols-2">
        <Field
          name="mileageFrom"
          label={`Mileage from (${choices.unit})`}
          inputMode="numeric"
          hint="Leave empty for any mileage."
          defaultValue={values.mileageFrom}
          errors={errors?.mileageFrom}
        />
        <Field
          name="mileageTo"
          label={`Mileage to (${choices.unit})`}
          inputMode="numeric"
          defaultValue={values.mileageTo}
          errors={errors?.mileageTo}
        />
      </div>

      <fieldset>
        <legend className="mb-2 text-sm font-medium">Symptoms</legend>
        <div className="flex flex-wrap gap-x-5 gap-y-2 text-sm">
          {choices.symptoms.map((s) => (
            <label key={s.slug} className="flex items-center gap-2">
              <input
                type="checkbox"
                name={`symptom:${s.slug}`}
                defaultChecked={isChecked(`symptom:${s.slug}`)}
              />
              {s.label}
            </label>
          ))}
        </div>
      </fieldset>

      <div className="grid gap-4 md:grid-cols-2">
        <Field
          name="dtcCodes"
          label="DTCs"
          hint="Space or comma separated, e.g. P0496 P0441 (SAE J2012 form)."
          defaultValue={values.dtcCodes}
          errors={errors?.dtcCodes}
          className={`${inputClass} font-mono`}
        />
        <label className="block text-sm">
          <span className="mb-1 block font-medium">Component</span>
          <select name="componentSlug" defaultValue={values.componentSlug} className={inputClass}>
            <option value="">none</option>
            {choices.components.map((g) => (
              <optgroup key={g.system} label={g.system}>
                {g.items.map((c) => (
                  <option key={c.slug} value={c.slug}>
                    {c.name}
                  </option>
                ))}
              </optgroup>
            ))}
          </select>
        </label>
      </div>

      <TextArea
        name="checks"
        label="Quick checks, in order"
        hint="One check per line; the order is the order a technician should follow."
        rows={5}
        defaultValue={values.checks}
      />
      <TextArea
        name="fixDescription"
        label="The fix that held"
        defaultValue={values.fixDescription}
      />
      <div className="grid gap-4 sm:grid-cols-2">
        <Field
          name="laborOperation"
          label="Labour operation"
          defaultValue={values.laborOperation}
        />
        <Field
          name="typicalHours"
          label="Typical hours"
          inputMode="decimal"
          defaultValue={values.typicalHours}
          errors={errors?.typicalHours}
        />
      </div>
      <TextArea
        name="parts"
        label="Parts"
        hint="One part number per line, optionally × quantity, e.g. K2-4000 x1."
        defaultValue={values.parts}
        errors={errors?.parts}
      />

      <fieldset>
        <legend className="mb-2 text-sm font-medium">Cautions</legend>
        <div className="grid gap-2 text-sm sm:grid-cols-2">
          {choices.cautions.map((c) => (
            <label key={c.kind} className="flex items-start gap-2">
              <input
                type="checkbox"
                name={`caution:${c.kind}`}
                defaultChecked={isChecked(`caution:${c.kind}`)}
                className="mt-1"
              />
              <span>
                <span className="font-medium">{c.title}</span>
                {c.text ? <span className="block text-ink-soft">{c.text}</span> : null}
              </span>
            </label>
          ))}
        </div>
        <div className="mt-3">
          <TextArea
            name="cautionText"
            label="Other caution (free text)"
            rows={2}
            defaultValue={values.cautionText}
          />
        </div>
      </fieldset>

      <div className="flex items-center gap-3">
        <button type="submit" className={buttonClass.primary} disabled={isPending}>
          {isPending ? "Saving…" : submitLabel}
        </button>
        {state ? (
          <p
            role={state.ok ? "status" : "alert"}
            className={state.ok ? "text-ok-700" : "text-alarm-700"}
          >
            {state.message}
          </p>
        ) : null}
      </div>
    </form>
  );
}
