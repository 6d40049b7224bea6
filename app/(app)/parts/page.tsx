import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { AddPartForm } from "@/components/parts/part-forms";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { SearchForm } from "@/components/ui/search-form";
import { Pagination } from "@/components/ui/pagination";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { listComponentChoices, listParts } from "@/db/queries/parts";
import { requirePage } from "@/lib/auth/guard";
import { formatMoney } from "@/lib/format";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Parts" };

const Query = z.object({
  q: z.string().trim().max(100).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1).default(1),
  removed: z.literal("1").optional().catch(undefined),
});

const PAGE_SIZE = 50;

/** The table's columns: heading, and whether it holds numbers (right-aligned). */
const COLUMNS: [string, boolean][] = [
  ["Part number", false],
  ["Description", false],
  ["Component", false],
  ["On hand", true],
  ["Unit cost", true],
  ["Lead time", true],
];

export default async function PartsPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("parts:manage");
  const { q, page, removed } = Query.parse(await queryValues(searchParams));
  const db = await getDb();
  const [{ rows, total, all }, choices] = await Promise.all([
    listParts(db, auth, { q, page, pageSize: PAGE_SIZE }),
    listComponentChoices(db, auth),
  ]);
  return (
    <>
      <PageHeader
        title="Parts"
        description={`The parts list of ${auth.organisation.name}: ${all.toLocaleString("en-GB")} part${all === 1 ? "" : "s"}. What is on hand, what each costs and how long it takes to arrive are what the stocking plan works with.`}
        actions={
          <Link href="/stocking" className={buttonClass.secondary}>
            Stocking plan
          </Link>
        }
      />
      {removed ? (
        <p role="status" className="mb-4 text-sm text-ok-700">
          The part was removed from the list.
        </p>
      ) : null}
      <SearchForm
        action="/parts"
        label="Search parts"
        placeholder="Part number, description or component"
        defaultValue={q}
      />
      <div className="overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Parts list</caption>
          <thead className="border-b border-line bg-paper text-ink-soft">
            <tr>
              {COLUMNS.map(([label, isNumber]) => (
                <th
                  key={label}
                  scope="col"
                  className={`px-3 py-2 font-medium ${isNumber ? "text-right" : ""}`}
                >
                  {label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((p) => (
              <tr key={p.id} className="border-b border-line/60 last:border-0 hover:bg-sea-50">
                <td className="px-3 py-2 font-mono text-[13px]">
                  <Link href={`/parts/${p.id}`}>{p.partNumber}</Link>
                </td>
                <td className="px-3 py-2">{p.description}</td>
                <td className="px-3 py-2">{p.component ?? "—"}</td>
                <td className="px-3 py-2 text-right tabular-nums">
                  {p.onHand.toLocaleString("en-GB")}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">
                  {p.unitCostCents === null ? "—" : formatMoney(p.unitCostCents)}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">
                  {p.leadTimeDays === null ? "—" : `${p.leadTimeDays} d`}
                </td>
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={COLUMNS.length} className="px-3 py-6 text-center text-ink-soft">
                  {q
                    ? "No part matches this search."
                    : "No parts yet: add them below, or import a parts list on the Imports page."}
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <Pagination page={page} pageSize={PAGE_SIZE} total={total} basePath="/parts" params={{ q }} />
      <Panel title="Add a part" className="mt-8">
        <AddPartForm choices={choices} />
      </Panel>
    </>
  );
}
