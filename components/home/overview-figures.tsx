"use client";

import { useQuery } from "@tanstack/react-query";
import { Skeleton } from "@/components/ui/skeleton";

type Overview = {
  vehicles: number;
  repairOrders: number;
  faultEvents: number;
  fillUps: number;
  lastImport: { fileName: string; kind: string; status: string; createdAt: string } | null;
};

async function fetchOverview(): Promise<Overview> {
  const res = await fetch("/api/overview", { headers: { accept: "application/json" } });
  if (!res.ok)
    throw new Error(res.status === 401 ? "Your session has ended." : "Could not load figures.");
  return res.json() as Promise<Overview>;
}

const FIGURES: { key: keyof Omit<Overview, "lastImport">; label: string }[] = [
  { key: "vehicles", label: "Vehicles" },
  { key: "repairOrders", label: "Repair orders" },
  { key: "faultEvents", label: "Fault-code events" },
  { key: "fillUps", label: "Fill-ups" },
];

/** Headline counts of the active organisation, fetched from /api/overview. */
export function OverviewFigures({ organisationId }: { organisationId: number }) {
  const { data, error, isPending, refetch } = useQuery({
    queryKey: ["overview", organisationId],
    queryFn: fetchOverview,
  });
  if (error) {
    return (
      <div role="alert" className="rounded-lg border border-alarm-700/30 bg-alarm-100 p-4 text-sm">
        {error.message}{" "}
        <button type="button" className="underline" onClick={() => void refetch()}>
          Try again
        </button>
      </div>
    );
  }
  return (
    <div>
      <dl className="grid grid-cols-2 gap-3 lg:grid-cols-4" aria-busy={isPending}>
        {FIGURES.map((f) => (
          <div key={f.key} className="rounded-lg border border-line bg-panel p-4">
            <dt className="text-sm text-ink-soft">{f.label}</dt>
            <dd
              className="mt-1 text-3xl font-semibold tabular-nums text-ink"
              data-testid={`figure-${f.key}`}
            >
              {isPending ? <Skeleton className="h-9 w-24" /> : data[f.key].toLocaleString("en-GB")}
            </dd>
          </div>
        ))}
      </dl>
      <p className="mt-3 text-sm text-ink-soft" data-testid="last-import">
        {isPending
          ? "\u00a0"
          : data.lastImport
            ? `Last import: ${data.lastImport.fileName} (${data.lastImport.kind}, ${data.lastImport.status}) on ${data.lastImport.createdAt.slice(0, 10)}`
            : "No file imported yet: the data here was loaded by the demo or added by hand."}
      </p>
    </div>
  );
}
