"use client";

import { addToCampaignAction, setDoneAction } from "@/app/(app)/at-risk/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { useFormAction } from "@/components/ui/use-form-action";

/**
 * The watch-list's form: its rows carry the vehicle checkboxes (form="add-to-campaign"), this
 * part chooses the list.
 */
export function AddToCampaignForm({ campaigns }: { campaigns: { id: number; name: string }[] }) {
  const { state, isPending, onSubmit, fieldErrors } = useFormAction(addToCampaignAction);
  return (
    <form
      id="add-to-campaign"
      onSubmit={onSubmit}
      className="flex flex-wrap items-end gap-3 text-sm"
      aria-label="Add to a campaign list"
    >
      <label className="flex flex-col gap-1">
        <span className="font-medium">Existing list</span>
        <select name="campaignId" className={inputClass} defaultValue="">
          <option value="">a new list…</option>
          {campaigns.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </select>
      </label>
      <label className="flex flex-col gap-1">
        <span className="font-medium">New list name</span>
        <input name="name" className={inputClass} placeholder="e.g. Purge valves before winter" />
      </label>
      <button type="submit" className={buttonClass.primary} disabled={isPending}>
        Add ticked vehicles
      </button>
      {state ? (
        <p
          role={state.ok ? "status" : "alert"}
          className={state.ok ? "text-ok-700" : "text-alarm-700"}
        >
          {state.message} {fieldErrors ? Object.values(fieldErrors).flat().join(" ") : null}
        </p>
      ) : null}
    </form>
  );
}

export function DoneToggle({
  campaignId,
  campaignVehicleId,
  isDone,
  label,
}: {
  campaignId: number;
  campaignVehicleId: number;
  isDone: boolean;
  label: string;
}) {
  const { state, isPending, onSubmit } = useFormAction(setDoneAction);
  return (
    <form onSubmit={onSubmit} className="inline">
      <input type="hidden" name="campaignId" value={campaignId} />
      <input type="hidden" name="campaignVehicleId" value={campaignVehicleId} />
      <input type="hidden" name="done" value={isDone ? "0" : "1"} />
      <button
        type="submit"
        className={buttonClass.secondary}
        disabled={isPending}
        aria-label={`${isDone ? "Mark not done" : "Mark done"}: ${label}`}
      >
        {isDone ? "Mark not done" : "Mark done"}
      </button>
      {state && !state.ok ? (
        <span role="alert" className="ml-2 text-alarm-700">
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
