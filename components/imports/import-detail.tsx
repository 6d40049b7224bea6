"use client";

import { useQuery } from "@tanstack/react-query";
import { Skeleton } from "@/components/ui/skeleton";
import { fetchJson, type ImportSummary } from "./api";
import { ImportProgress } from "./import-progress";
import { ImportResult } from "./import-result";
import { ACTIVE_STATUSES } from "./kinds";
import { MappingStep } from "./mapping-step";

/** One import through its life: mapping → progress → result. */
export function ImportDetail({
  importId,
  kind,
  canWrite,
}: {
  importId: number;
  kind: string;
  canWrite: boolean;
}) {
  const { data, error, isPending } = useQuery({
    queryKey: ["import", importId],
    queryFn: () => fetchJson<ImportSummary>(`/api/imports/${importId}`),
    refetchInterval: (q) =>
      q.state.data && ACTIVE_STATUSES.has(q.state.data.status) ? 750 : false,
  });
  if (error)
    return (
      <p role="alert" className="text-alarm-700">
        {error.message}
      </p>
    );
  if (isPending) return <Skeleton className="h-64" />;
  if (data.status === "uploaded") {
    return canWrite ? (
      <MappingStep importId={importId} kind={kind} />
    ) : (
      <p className="text-ink-soft">This file is waiting for a manager to map its columns.</p>
    );
  }
  if (ACTIVE_STATUSES.has(data.status))
    return <ImportProgress summary={data} canWrite={canWrite} />;
  return <ImportResult summary={data} canWrite={canWrite} />;
}
