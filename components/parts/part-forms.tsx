"use client";

import {
  countPartsAction,
  createPartAction,
  deletePartAction,
  receivePartsAction,
  updatePartAction,
} from "@/app/(app)/parts/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { ActionMessage } from "@/components/ui/action-message";
import { useFormAction } from "@/components/ui/use-form-action";

export type ComponentChoice = { slug: string; system: string; name: string };

/** What a part's details form starts from. */
export type PartDetails = {
  description: string;
  componentSlug: string | null;
  unitCost: string;
  leadTimeDays: number | null;
};

function ComponentSelect({
  choices,
  defaultValue,
  errors,
}: {
  choices: ComponentChoice[];
  defaultValue?: string | null;
  errors?: string[];
}) {
  const systems = [...new Set(choices.map((c) => c.system))];
  return (
    <label className="block text-sm">
      <span className="mb-1 block font-medium text-ink">Component</span>
      <select
        name="componentSlug"
        defaultValue={defaultValue ?? ""}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={errors?.length ? "componentSlug-error" : undefined}
        className={inputClass}
      >
        <option value="">Not filed under a component</option>
        {systems.map((system) => (
          <optgroup key={system} label={system}>
            {choices
              .filter((c) => c.system === system)
              .map((c) => (
                <option key={c.slug} value={c.slug}>
                  {c.name}
                </option>
              ))}
          </optgroup>
        ))}
      </select>
      {errors?.length ? (
        <span id="componentSlug-error" className="mt-1 block text-alarm-700">
          {errors.join(" ")}
        </span>
      ) : null}
    </label>
  );
}

/** Description, component, cost and lead time: the fields shared by adding and editing. */
function DetailFields({
  choices,
  initial,
  errors,
}: {
  choices: ComponentChoice[];
  initial?: PartDetails;
  errors?: Record<string, string[] | undefined>;
}) {
  return (
    <>
      <Field
        name="description"
        label="Description"
        required
        maxLength={200}
        defaultValue={initial?.description}
        errors={errors?.description}
      />
      <ComponentSelect
        choices={choices}
        defaultValue={initial?.componentSlug}
        errors={errors?.componentSlug}
      />
      <Field
        name="unitCostCents"
        label="Unit cost"
        hint="Blank: not known"
        inputMode="decimal"
        defaultValue={initial?.unitCost}
        errors={errors?.unitCostCents}
      />
      <Field
        name="leadTimeDays"
        label="Lead time (days)"
        hint="Blank: the plan's default"
        inputMode="numeric"
        defaultValue={initial?.leadTimeDays ?? undefined}
        errors={errors?.leadTimeDays}
      />
    </>
  );
}

export function AddPartForm({ choices }: { choices: ComponentChoice[] }) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(createPartAction, {
    resetOnSuccess: true,
  });
  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      aria-label="Add a part"
      className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3"
    >
      <Field
        name="partNumber"
        label="Part number"
        required
        maxLength={40}
        autoComplete="off"
        spellCheck={false}
        errors={fieldErrors?.partNumber}
        className={`${inputClass} font-mono`}
      />
      <DetailFields choices={choices} errors={fieldErrors} />
      <Field
        name="onHand"
        label="On hand"
        hint="Blank: 0"
        inputMode="numeric"
        errors={fieldErrors?.onHand}
      />
      <div className="flex items-center gap-3 sm:col-span-2 lg:col-span-3">
        <button type="submit" className={buttonClass.primary} disabled={isPending}>
          {isPending ? "Adding…" : "Add part"}
        </button>
        <ActionMessage state={state} />
      </div>
    </form>
  );
}

export function EditPartForm({
  partId,
  choices,
  initial,
}: {
  partId: number;
  choices: ComponentChoice[];
  initial: PartDetails;
}) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(updatePartAction);
  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      aria-label="Part details"
      className="grid gap-4 sm:grid-cols-2"
    >
      <input type="hidden" name="partId" value={partId} />
      <DetailFields choices={choices} initial={initial} errors={fieldErrors} />
      <div className="flex items-center gap-3 sm:col-span-2">
        <button type="submit" className={buttonClass.primary} disabled={isPending}>
          {isPending ? "Saving…" : "Save"}
        </button>
        <ActionMessage state={state} />
      </div>
    </form>
  );
}

/** One number and a button: a delivery received, or a stock count. */
function QuantityForm({
  partId,
  action,
  name,
  label,
  hint,
  button,
}: {
  partId: number;
  action: typeof receivePartsAction;
  name: "quantity" | "onHand";
  label: string;
  hint: string;
  button: string;
}) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(action, {
    resetOnSuccess: true,
  });
  return (
    <form ref={formRef} onSubmit={onSubmit} aria-label={label} className="space-y-2">
      <input type="hidden" name="partId" value={partId} />
      <Field
        name={name}
        label={label}
        hint={hint}
        inputMode="numeric"
        required
        errors={fieldErrors?.[name]}
      />
      <button type="submit" className={buttonClass.secondary} disabled={isPending}>
        {button}
      </button>
      <ActionMessage state={state} />
    </form>
  );
}

export function ReceivePartsForm({ partId }: { partId: number }) {
  return (
    <QuantityForm
      partId={partId}
      action={receivePartsAction}
      name="quantity"
      label="Quantity received"
      hint="Added to what is on hand."
      button="Book the delivery"
    />
  );
}

export function CountPartsForm({ partId }: { partId: number }) {
  return (
    <QuantityForm
      partId={partId}
      action={countPartsAction}
      name="onHand"
      label="Quantity counted"
      hint="Replaces what is on hand."
      button="Record the count"
    />
  );
}

export function DeletePartForm({ partId }: { partId: number }) {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(deletePartAction);
  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      aria-label="Remove the part"
      className="space-y-2 text-sm"
    >
      <input type="hidden" name="partId" value={partId} />
      <label className="flex items-center gap-2">
        <input type="checkbox" name="confirm" value="yes" />
        Remove this part from the list (repair history and known issues keep its number)
      </label>
      {fieldErrors?.confirm ? (
        <p className="text-alarm-700">{fieldErrors.confirm.join(" ")}</p>
      ) : null}
      <button type="submit" className={buttonClass.secondary} disabled={isPending}>
        Remove
      </button>
      <ActionMessage state={state} />
    </form>
  );
}
