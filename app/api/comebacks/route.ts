import { z } from "zod";
import { getDb } from "@/db";
import { getComebackReport } from "@/db/queries/comebacks";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { toCsv } from "@/lib/import";

export const dynamic = "force-dynamic";

const ComebackQuery = z.object({ format: z.enum(["json", "csv"]).default("json") });

const CSV_COLUMNS = [
  "faults",
  "days_between",
  "distance_between_mi",
  "vehicle_id",
  "first_ro",
  "first_date",
  "first_odometer_mi",
  "first_complaint",
  "first_cause",
  "first_correction",
  "first_technician",
  "first_vendor",
  "again_ro",
  "again_date",
  "again_odometer_mi",
  "again_complaint",
  "again_cause",
  "again_correction",
  "again_technician",
  "again_vendor",
] as const;

/**
 * The organisation's comeback report (JSON), or as CSV the list of comebacks with both repair
 * orders side by side, safe to open in a spreadsheet (toCsv guards against formula injection).
 * `faults` names each fault (a DTC with its description, or "System → Component"), joined by
 * "; ".
 */
export const GET = apiRoute("comebacks:read", async (req, auth) => {
  const q = ComebackQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success)
    return jsonError(400, q.error.issues[0]?.message ?? "Invalid query.", q.error.issues);
  const report = await getComebackReport(await getDb(), auth);
  if (q.data.format === "json") return Response.json(report);
  const odo = (mi: number | null) => (mi === null ? null : Math.round(mi));
  const body = toCsv(
    [...CSV_COLUMNS],
    report.pairs.map((p) => [
      p.faults.join("; "),
      p.days,
      p.miles === null ? null : Math.round(p.miles),
      p.first.vehicleId,
      p.first.roNumber,
      p.first.openedOn,
      odo(p.first.odometerMi),
      p.first.complaint,
      p.first.cause,
      p.first.correction,
      p.first.technician,
      p.first.vendor,
      p.again.roNumber,
      p.again.openedOn,
      odo(p.again.odometerMi),
      p.again.complaint,
      p.again.cause,
      p.again.correction,
      p.again.technician,
      p.again.vendor,
    ]),
    { withBom: true },
  );
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="recurra-comebacks-${report.asOf ?? "all"}.csv"`,
    },
  });
});
