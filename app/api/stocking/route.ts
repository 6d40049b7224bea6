import { getDb } from "@/db";
import { getStockingPlan } from "@/db/queries/stocking";
import { toCsv } from "@/lib/import";
import { apiRoute, jsonError } from "@/lib/auth/guard";
import { demandKinds } from "@/lib/stocking";
import { StockingQuery } from "@/lib/stocking-request";

export const dynamic = "force-dynamic";

const CSV_COLUMNS = [
  "part_number",
  "description",
  "component",
  "abc",
  "expected_demand",
  "demand_low",
  "demand_high",
  "period_days",
  "stock_level",
  "on_hand",
  "reorder",
  "unit_cost",
  "reorder_value",
  "expected_shortfall_on_hand",
  "demand_kind",
] as const;

/**
 * The stocking plan of the customer base (JSON), or as CSV the purchase list: parts to reorder
 * with quantities and values, and the kinds of work their demand comes from (`demand_kind`:
 * service, wear, failure, joined with "+" largest first), safe to open in a spreadsheet.
 */
export const GET = apiRoute("stocking:read", async (req, auth) => {
  const q = StockingQuery.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success)
    return jsonError(400, q.error.issues[0]?.message ?? "Invalid settings.", q.error.issues);
  const plan = await getStockingPlan(await getDb(), auth, q.data);
  if (q.data.format === "json") return Response.json(plan);
  const rows = plan.parts.filter((p) => q.data.only === "all" || p.reorder > 0);
  const body = toCsv(
    [...CSV_COLUMNS],
    rows.map((p) => [
      p.partNumber,
      p.description,
      p.component,
      p.abc,
      Number(p.expectedDemand.toFixed(3)),
      p.demandLower === null ? null : Number(p.demandLower.toFixed(3)),
      p.demandUpper === null ? null : Number(p.demandUpper.toFixed(3)),
      p.periodDays,
      p.stockLevel,
      p.onHand,
      p.reorder,
      p.unitCostCents === null ? null : (p.unitCostCents / 100).toFixed(2),
      p.unitCostCents === null ? null : ((p.unitCostCents * p.reorder) / 100).toFixed(2),
      Number(p.shortfallOnHand.toFixed(3)),
      demandKinds(p.demandByKind).join("+"),
    ]),
    { withBom: true },
  );
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="recurra-purchase-list-${plan.asOf}.csv"`,
    },
  });
});
