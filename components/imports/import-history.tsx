"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { Skeleton } from "@/components/ui/skeleton";
import { fetchJson, type ImportSummary } from "./api";
import { ACTIVE_STATUSES, KIND_LABELS, STATUS_LABELS } from "./kinds";

const n = (v: number) => v.toLocaleString("en-GB");

/** Every import of the organisation, newest first; refreshes while one is running. */
export function ImportHistory() {
  const { data, error, isPending } = useQuery({
    queryKey: ["imports"],
    queryFn: () => fetchJson<{ rows: ImportSummary[]; total: number }>("/api/imports?pageSize=50"),
    refetchInterval: (q) =>
      q.state.data?.rows.some((r) => ACTIVE_STATUSES.has(r.status)) ? 1500 : false,
  });
  if (error)
    return (
      <p role="alert" className="text-alarm-700">
        {error.message}
      </p>
    );
  if (isPending) return <Skeleton className="h-40" />;
  if (data.rows.length === 0) return <p className="text-ink-soft">No imports yet.</p>;
  return (
    <div className="overflow-x-auto rounded-lg border border-line bg-panel">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Import history</caption>
        <thead className="border-b border-line bg-paper text-ink-soft">
          <tr>
            <th className="px-3 py-2 font-medium">When (UTC)</th>
            <th className="px-3 py-2 font-medium">File</th>
            <th className="px-3 py-2 font-medium">Kind</th>
            <th className="px-3 py-2 font-medium">Status</th>
            <th className="px-3 py-2 text-right font-medium">Read</th>
            <th className="px-3 py-2 text-right font-medium">Imported</th>
            <th className="px-3 py-2 text-right font-medium">Duplicates</th>
            <th className="px-3 py-2 text-right font-medium">Warnings</th>
            <th className="px-3 py-2 text-right font-medium">Rejected</th>
            <th className="px-3 py-2 font-medium">By</th>
          </tr>
        </thead>
        <tbody>
          {data.rows.map((r) => (
            <tr key={r.id} className="border-b border-line/60 last:border-0">
              <td className="whitespace-nowrap px-3 py-2 tabular-nums">
                {r.createdAt.replace("T", " ").slice(0, 16)}
              </td>
              <td className="px-3 py-2">
                <Link href={`/imports/${r.id}`}>{r.fileName}</Link>
              </td>
              <td className="px-3 py-2">
                {KIND_LABELS[r.kind as keyof typeof KIND_LABELS]?.split(" (")[0] ?? r.kind}
              </td>
              <td className="px-3 py-2">{STATUS_LABELS[r.status] ?? r.status}</td>
              <td className="px-3 py-2 text-right tabular-nums">{n(r.rowsTotal)}</td>
              <td className="px-3 py-2 text-right tabular-nums">{n(r.rowsImported)}</td>
              <td className="px-3 py-2 text-right tabular-nums">{n(r.rowsDuplicate)}</td>
              <td className="px-3 py-2 text-right tabular-nums">{n(r.rowsWarning)}</td>
              <td className="px-3 py-2 text-right tabular-nums">{n(r.rowsRejected)}</td>
              <td className="px-3 py-2">{r.createdByName ?? "command line"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
