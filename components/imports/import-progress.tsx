"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { buttonClass } from "@/components/ui/button";
import { fetchJson, type ImportSummary } from "./api";
import { ImportCounts } from "./import-counts";
import { STATUS_LABELS } from "./kinds";

export function ImportProgress({
  summary,
  canWrite,
}: {
  summary: ImportSummary;
  canWrite: boolean;
}) {
  const queryClient = useQueryClient();
  const cancel = useMutation({
    mutationFn: () => fetchJson(`/api/imports/${summary.id}/cancel`, { method: "POST" }),
    onSettled: () => queryClient.invalidateQueries({ queryKey: ["import", summary.id] }),
  });
  const fraction =
    summary.status === "applying"
      ? 1
      : summary.sizeBytes > 0
        ? Math.min(1, summary.bytesRead / summary.sizeBytes)
        : 0;
  const percent = Math.round(fraction * 100);
  return (
    <section
      aria-labelledby="progress-title"
      className="space-y-4 rounded-lg border border-line bg-panel p-5"
    >
      <h2 id="progress-title" className="text-base">
        {STATUS_LABELS[summary.status]}
        {summary.cancelRequestedAt ? " · stopping…" : ""}
      </h2>
      <div>
        <div
          role="progressbar"
          aria-label="Import progress"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
          className="h-3 overflow-hidden rounded bg-line/60"
        >
          <div
            className={`h-full bg-sea-600 transition-[width] ${summary.status === "applying" ? "animate-pulse" : ""}`}
            style={{ width: `${percent}%` }}
          />
        </div>
        <p className="mt-1 text-sm text-ink-soft">
          {summary.status === "queued"
            ? "Waiting for a worker to pick the import up."
            : summary.status === "applying"
              ? "All rows are read and checked; adding them to your data in one step."
              : `${percent}% of the file read (${(summary.bytesRead / 1_048_576).toFixed(1)} of ${(summary.sizeBytes / 1_048_576).toFixed(1)} MB).`}
        </p>
      </div>
      <ImportCounts summary={summary} />
      {canWrite && summary.status !== "applying" ? (
        <div>
          <button
            type="button"
            className={buttonClass.secondary}
            disabled={cancel.isPending || Boolean(summary.cancelRequestedAt)}
            onClick={() => cancel.mutate()}
          >
            Cancel import
          </button>
          {cancel.error ? (
            <p role="alert" className="mt-2 text-sm text-alarm-700">
              {cancel.error.message}
            </p>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}
