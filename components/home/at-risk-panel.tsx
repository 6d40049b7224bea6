"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { Panel } from "@/components/ui/panel";
import { Skeleton } from "@/components/ui/skeleton";
import { fetchJson } from "@/components/ui/fetch-json";
import type { AtRiskRow } from "@/db/queries/at-risk";
import { describeOutlook, formatConfidence } from "@/lib/plain-words";
import { formatDistance } from "@/lib/units";
import { AT_RISK_HORIZON } from "@/lib/at-risk";

const SHOWN = 5;

/**
 * Home: the vehicles most at risk over the watch-list's default horizon, fetched after the page
 * shows (the list reads every confirmed known issue's evidence, too slow to hold the page for).
 */
export function AtRiskPanel({ unit }: { unit: "mi" | "km" }) {
  const query = useQuery({
    queryKey: ["home-at-risk"],
    queryFn: () =>
      fetchJson<{ rows: AtRiskRow[]; total: number; confidence: number }>(
        `/api/at-risk?limit=${SHOWN}&next=${AT_RISK_HORIZON}`,
      ),
  });
  return (
    <Panel title="Vehicles at risk">
      {query.isPending ? (
        <div role="status" aria-label="Loading the vehicles at risk" className="space-y-2">
          <Skeleton />
          <Skeleton />
          <Skeleton />
        </div>
      ) : query.isError ? (
        <p role="alert" className="text-sm text-alarm-700">
          {query.error.message}
        </p>
      ) : query.data.total === 0 ? (
        <p className="text-sm text-ink-soft">
          No vehicle is inside or near the mileage range of a confirmed known issue or a signal.
        </p>
      ) : (
        <>
          <p className="text-sm text-ink-soft">
            {query.data.total.toLocaleString("en-GB")} vehicles inside or near the mileage range of
            a confirmed known issue or a signal; the most at risk over their next{" "}
            {AT_RISK_HORIZON.toLocaleString("en-GB")} {unit} first. &ldquo;Likely&rdquo; is at{" "}
            {formatConfidence(query.data.confidence)} confidence, allowing for how sure the
            cohort&apos;s rates are.
          </p>
          <ul className="mt-2 divide-y divide-line/60 text-sm" aria-label="Vehicles most at risk">
            {query.data.rows.map((r) => (
              <li
                key={`${r.vehicleId}|${r.source.kind === "signal" ? r.source.faultKey : r.source.id}`}
                className="py-1.5"
              >
                <Link href={`/vehicles/${r.vehicleId}`} className="font-medium">
                  {r.unitNumber ?? r.vin ?? `#${r.vehicleId}`}
                </Link>{" "}
                <span className="text-ink-soft">
                  {r.cohort} · {formatDistance(r.odometerMi, unit)}
                </span>
                <span className="block text-ink-soft">
                  {r.source.kind === "known-issue" ? r.source.title : `Signal: ${r.source.label}`} ·{" "}
                  <span data-testid="expected">
                    {describeOutlook({
                      expected: r.expected,
                      lower: r.expectedLower,
                      upper: r.expectedUpper,
                      noun: ["failure"],
                    })}
                  </span>
                </span>
              </li>
            ))}
          </ul>
        </>
      )}
      <Link href="/at-risk" className="mt-2 inline-block text-sm">
        All vehicles at risk →
      </Link>
    </Panel>
  );
}
