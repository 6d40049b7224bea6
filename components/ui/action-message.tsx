import type { ActionResult } from "@/lib/auth/action";

/** A server action's answer under its form: a status when it worked, an alert when it did not. */
export function ActionMessage({ state }: { state: ActionResult | null }) {
  if (!state) return null;
  return (
    <p
      role={state.ok ? "status" : "alert"}
      className={`text-sm ${state.ok ? "text-ok-700" : "text-alarm-700"}`}
    >
      {state.message}
    </p>
  );
}
