"use client";

import { inviteAction } from "@/app/(app)/settings/members/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { useFormAction } from "@/components/ui/use-form-action";

const ROLE_OPTIONS = [
  ["technician", "Technician"],
  ["viewer", "Viewer"],
  ["manager", "Manager"],
  ["admin", "Admin"],
] as const;

export function InviteForm() {
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(inviteAction, {
    resetOnSuccess: true,
  });
  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      noValidate
      aria-label="Invite a member"
      className="grid items-start gap-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_auto]"
    >
      <Field
        name="email"
        label="E-mail"
        type="email"
        autoComplete="off"
        placeholder="name@example.com"
        errors={fieldErrors?.email}
      />
      <label className="block text-sm">
        <span className="mb-1 block font-medium text-ink">Role</span>
        <select name="role" defaultValue="technician" className={inputClass}>
          {ROLE_OPTIONS.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </select>
        {fieldErrors?.role ? (
          <span className="mt-1 block text-alarm-700">{fieldErrors.role.join(" ")}</span>
        ) : null}
      </label>
      <div className="sm:pt-6">
        <button type="submit" className={buttonClass.primary} disabled={isPending}>
          {isPending ? "Sending…" : "Send invitation"}
        </button>
      </div>
      {state ? (
        <p
          role={state.ok ? "status" : "alert"}
          className={`sm:col-span-3 ${state.ok ? "text-ok-700" : "text-alarm-700"}`}
        >
          {state.message}
        </p>
      ) : null}
    </form>
  );
}
