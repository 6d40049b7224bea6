"use client";

import { changeRoleAction } from "@/app/(app)/settings/members/actions";
import { buttonClass } from "@/components/ui/button";
import { useFormAction } from "@/components/ui/use-form-action";

const ROLE_OPTIONS = [
  ["admin", "Admin"],
  ["manager", "Manager"],
  ["technician", "Technician"],
  ["viewer", "Viewer"],
] as const;

export function MemberRoleForm({
  membershipId,
  role,
  name,
}: {
  membershipId: number;
  role: string;
  name: string;
}) {
  const { state, isPending, formRef, onSubmit } = useFormAction(changeRoleAction);
  return (
    <form ref={formRef} onSubmit={onSubmit} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="membershipId" value={membershipId} />
      <select
        name="role"
        defaultValue={role}
        aria-label={`Role of ${name}`}
        className="rounded-md border border-line-strong bg-white px-2 py-1 text-sm"
      >
        {ROLE_OPTIONS.map(([value, label]) => (
          <option key={value} value={value}>
            {label}
          </option>
        ))}
      </select>
      <button
        type="submit"
        className={`${buttonClass.quiet} border border-line`}
        disabled={isPending}
      >
        Change
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
