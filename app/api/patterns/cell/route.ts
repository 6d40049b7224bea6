import { z } from "zod";
import { getDb } from "@/db";
import { getCellDetail } from "@/db/queries/patterns";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { CellKeyQuery } from "@/lib/cell-request";
import { toCsv } from "@/lib/import";

export const dynamic = "force-dynamic";

const Format = z.object({ format: z.enum(["json", "csv"]).default("json") });

/** One cell's detail; `format=csv` exports its repair lines (safe for spreadsheets). */
export const GET = apiRoute("patterns:read", async (req, auth) => {
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const key = CellKeyQuery.safeParse(params);
  const f = Format.safeParse(params);
  if (!key.success || !f.success)
    return jsonError(400, "Invalid cell.", key.error?.issues ?? f.error?.issues);
  const detail = await getCellDetail(await getDb(), auth, key.data);
  if (!detail) return jsonError(404, "No such cell in the latest analysis of this organisation.");
  if (f.data.format === "json") return Response.json(detail);
  const header = [
    "ro_number",
    "unit_number",
    "vin",
    "opened_on",
    "closed_on",
    "odometer_mi",
    "complaint",
    "cause",
    "correction",
    "dtc_codes",
    "cost",
    "labor_hours",
    "technician",
    "vendor",
  ];
  const body = toCsv(
    header,
    detail.lines.map((l) => [
      l.roNumber,
      l.unitNumber,
      l.vin,
      l.openedOn,
      l.closedOn,
      l.odometerMi === null ? null : Math.round(l.odometerMi),
      l.complaint,
      l.cause,
      l.correction,
      l.dtcCodes,
      (l.costCents / 100).toFixed(2),
      l.laborHours,
      l.technician,
      l.vendor,
    ]),
    { withBom: true },
  );
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": 'attachment; filename="recurra-cell-repair-orders.csv"',
    },
  });
});
