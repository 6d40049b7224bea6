"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { fetchJson, type ImportSummary } from "./api";
import { ImportCounts } from "./import-counts";
import { STATUS_LABELS } from "./kinds";

type Reject = {
  rowNumber: number;
  severity: "rejected" | "warning";
  column: string | null;
  reason: string;
  raw: string | null;
};
const PAGE_SIZE = 50;

function RejectsReport({
  importId,
  severity,
}: {
  importId: number;
  severity: "rejected" | "warning";
}) {
  const [page, setPage] = useState(1);
  const { data, error, isPending } = useQuery({
    queryKey: ["rejects", importId, severity, page],
    queryFn: () =>
      fetchJson<{ rows: Reject[]; total: number }>(
        `/api/imports/${importId}/rejects?severity=${severity}&page=${page}&pageSize=${PAGE_SIZE}`,
      ),
  });
  if (error)
    return (
      <p role="alert" className="text-alarm-700">
        {error.message}
      </p>
    );
  if (isPending) return <p className="text-sm text-ink-soft">Loading…</p>;
  if (data.total === 0) return <p className="text-sm text-ink-soft">None.</p>;
  const pages = Math.ceil(data.total / PAGE_SIZE);
  return (
    <div>
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="text-ink-soft">
            <tr>
              <th className="py-1 pr-3 font-medium">Row</th>
              <th className="py-1 pr-3 font-medium">Column</th>
              <th className="py-1 pr-3 font-medium">Reason</th>
              <th className="py-1 font-medium">Original row</th>
            </tr>
          </thead>
          <tbody>
            {data.rows.map((r, i) => (
              <tr key={`${r.rowNumber}-${i}`} className="border-t border-line/60 align-top">
                <td className="py-1.5 pr-3 tabular-nums">{r.rowNumber}</td>
                <td className="py-1.5 pr-3 font-mono text-[13px]">{r.column || "—"}</td>
                <td className="py-1.5 pr-3">{r.reason}</td>
                <td
                  className="max-w-md truncate py-1.5 font-mono text-xs text-ink-soft"
                  title={r.raw ?? ""}
                >
                  {r.raw}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {pages > 1 ? (
        <div className="mt-2 flex items-center gap-3 text-sm">
          <button
            type="button"
            className={buttonClass.quiet}
            disabled={page <= 1}
            onClick={() => setPage(page - 1)}
          >
            ← Previous
          </button>
          <span className="text-ink-soft">
            Page {page} of {pages}
          </span>
          <button
            type="button"
            className={buttonClass.quiet}
            disabled={page >= pages}
            onClick={() => setPage(page + 1)}
          >
            Next →
          </button>
        </div>
      ) : null}
    </div>
  );
}

export function ImportResult({ summary, canWrite }: { summary: ImportSummary; canWrite: boolean }) {
  const queryClient = useQueryClient();
  const [isConfirming, setConfirming] = useState(false);
  const undo = useMutation({
    mutationFn: () => fetchJson(`/api/imports/${summary.id}/undo`, { method: "POST" }),
    onSuccess: () => {
      setConfirming(false);
      void queryClient.invalidateQueries({ queryKey: ["import", summary.id] });
      void queryClient.invalidateQueries({ queryKey: ["imports"] });
    },
  });
  const tone =
    summary.status === "done"
      ? "bg-ok-100 text-ok-700"
      : summary.status === "failed"
        ? "bg-alarm-100 text-alarm-700"
        : "bg-sea-50 text-ink";
  return (
    <div className="space-y-6">
      <div role="status" className={`rounded-lg px-4 py-3 ${tone}`}>
        <p className="font-semibold">{STATUS_LABELS[summary.status] ?? summary.status}</p>
        <p className="text-sm">
          {summary.status === "done"
            ? `${summary.rowsImported.toLocaleString("en-GB")} rows added${summary.vehiclesCreated ? `, ${summary.vehiclesCreated} new vehicles` : ""}. The statistics are being recomputed.`
            : summary.status === "failed"
              ? `${summary.error ?? "The import failed."} Nothing from this file was added; the file is kept.`
              : summary.status === "cancelled"
                ? "Stopped before anything was added to your data."
                : `Removed on ${summary.undoneAt?.slice(0, 16).replace("T", " ")} UTC: none of this file's rows remain.`}
        </p>
      </div>
      <ImportCounts summary={summary} />
      {canWrite && summary.status === "done" ? (
        <div className="flex flex-wrap items-center gap-3">
          {isConfirming ? (
            <>
              <span className="text-sm">Remove every row this import added?</span>
              <button
                type="button"
                className={buttonClass.primary}
                disabled={undo.isPending}
                onClick={() => undo.mutate()}
              >
                Yes, undo the import
              </button>
              <button
                type="button"
                className={buttonClass.secondary}
                onClick={() => setConfirming(false)}
              >
                Keep it
              </button>
            </>
          ) : (
            <button
              type="button"
              className={buttonClass.secondary}
              onClick={() => setConfirming(true)}
            >
              Undo this import
            </button>
          )}
          {undo.error ? (
            <p role="alert" className="text-sm text-alarm-700">
              {undo.error.message}
            </p>
          ) : null}
        </div>
      ) : null}
      {summary.rowsRejected > 0 || summary.rowsWarning > 0 ? (
        <section
          aria-labelledby="rejects-title"
          className="space-y-4 rounded-lg border border-line bg-panel p-5"
        >
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 id="rejects-title" className="text-base">
              Rejects report
            </h2>
            <div className="flex gap-3 text-sm">
              <a href={`/api/imports/${summary.id}/rejects?format=csv&severity=rejected`}>
                Download rejected rows (CSV)
              </a>
              <a href={`/api/imports/${summary.id}/rejects?format=csv&severity=warning`}>
                Download warnings (CSV)
              </a>
            </div>
          </div>
          <h3 className="text-sm font-semibold">
            Rejected rows ({summary.rowsRejected.toLocaleString("en-GB")})
          </h3>
          <RejectsReport importId={summary.id} severity="rejected" />
          <h3 className="text-sm font-semibold">
            Rows imported with a warning ({summary.rowsWarning.toLocaleString("en-GB")})
          </h3>
          <RejectsReport importId={summary.id} severity="warning" />
        </section>
      ) : null}
    </div>
  );
}
