"use client";

import { useSession } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";

type Option = { organisationId: number; name: string; role: string };

/**
 * Switches the active organisation. The session update is checked on the server against the
 * user's memberships; the page then reloads its data for the new organisation.
 */
export function OrgSwitcher({ current, options }: { current: number; options: Option[] }) {
  const { update } = useSession();
  const router = useRouter();
  const [isPending, startTransition] = useTransition();
  const [error, setError] = useState<string | null>(null);
  const only = options[0];
  if (options.length < 2 && only) {
    return <span className="text-sm font-medium text-ink">{only.name}</span>;
  }
  return (
    <label className="flex items-center gap-2 text-sm">
      <span className="sr-only">Organisation</span>
      <select
        aria-label="Organisation"
        className="rounded-md border border-line-strong bg-white px-2 py-1.5 text-sm"
        value={current}
        disabled={isPending}
        onChange={(e) => {
          const organisationId = Number(e.target.value);
          setError(null);
          startTransition(async () => {
            const session = await update({ organisationId });
            if (session?.organisationId !== organisationId) {
              setError("Could not switch organisation.");
              return;
            }
            router.push("/");
            router.refresh();
          });
        }}
      >
        {options.map((o) => (
          <option key={o.organisationId} value={o.organisationId}>
            {o.name} ({o.role})
          </option>
        ))}
      </select>
      {error ? <span className="text-alarm-700">{error}</span> : null}
    </label>
  );
}
