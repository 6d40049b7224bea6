import { z } from "zod";
import { getDb } from "@/db";
import { getAtRiskVehicles } from "@/db/queries/at-risk";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { toCsv } from "@/lib/import";
import { unitToMiles } from "@/lib/units";
import { AT_RISK_HORIZON } from "@/lib/at-risk";

export const dynamic = "force-dynamic";

const Query = z.object({
  next: z.coerce.number().int().min(100).max(200_000).default(AT_RISK_HORIZON),
  format: z.enum(["json", "csv"]).default("json"),
  /** JSON only: the first rows (most expected failures first); `total` counts them all. */
  limit: z.coerce.number().int().min(1).max(1000).optional(),
});

/**
 * The at-risk watch-list (JSON: `{ rows, total, confidence }`), or as a spreadsheet-safe CSV. `next` is in
 * the organisation's unit.
 */
export const GET = apiRoute("campaigns:manage", async (req, auth) => {
  const q = Query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) return jsonError(400, "Invalid query parameters.", q.error.issues);
  const unit = auth.organisation.distanceUnit;
  const { rows, confidence } = await getAtRiskVehicles(await getDb(), auth, {
    nextMiles: unitToMiles(q.data.next, unit),
  });
  if (q.data.format === "json") {
    return Response.json({
      rows: rows.slice(0, q.data.limit ?? rows.length),
      total: rows.length,
      /** The level of each row's expectedLower–expectedUpper. */
      confidence,
    });
  }
  const body = toCsv(
    [
      "unit_number",
      "vin",
      "cohort",
      "odometer_mi",
      "why",
      "range_from_mi",
      "range_to_mi",
      "miles_to_range",
      "expected_failures",
      "expected_low",
      "expected_high",
      "fix_cost",
    ],
    rows.map((r) => [
      r.unitNumber,
      r.vin,
      r.cohort,
      Math.round(r.odometerMi),
      r.source.kind === "known-issue" ? r.source.title : `signal: ${r.source.label}`,
      r.rangeFromMi === null ? null : Math.round(r.rangeFromMi),
      r.rangeToMi === null ? null : Math.round(r.rangeToMi),
      Math.round(r.toRangeMi),
      Number(r.expected.toFixed(4)),
      r.expectedLower === null ? null : Number(r.expectedLower.toFixed(4)),
      r.expectedUpper === null ? null : Number(r.expectedUpper.toFixed(4)),
      r.fixCostCents === null ? null : (r.fixCostCents / 100).toFixed(2),
    ]),
    { withBom: true },
  );
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": 'attachment; filename="recurra-at-risk.csv"',
    },
  });
});
