import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { PageHeader } from "@/components/ui/page-header";
import { Pagination } from "@/components/ui/pagination";
import { getDb } from "@/db";
import { listAuditLog } from "@/db/queries/audit";
import { requirePage } from "@/lib/auth/guard";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Audit log" };

const Query = z.object({ page: z.coerce.number().int().min(1).catch(1).default(1) });
const PAGE_SIZE = 50;

export default async function AuditPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("audit:read");
  const { page } = Query.parse(await queryValues(searchParams));
  const { rows, total } = await listAuditLog(await getDb(), auth, { page, pageSize: PAGE_SIZE });
  return (
    <>
      <PageHeader
        title="Audit log"
        description="Every change made in this organisation: who, what and when."
        actions={<Link href="/settings">← Settings</Link>}
      />
      <div className="overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-line bg-paper text-ink-soft">
            <tr>
              <th className="px-3 py-2 font-medium">When (UTC)</th>
              <th className="px-3 py-2 font-medium">Who</th>
              <th className="px-3 py-2 font-medium">What</th>
              <th className="px-3 py-2 font-medium">Detail</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id} className="border-b border-line/60 align-top last:border-0">
                <td className="whitespace-nowrap px-3 py-2 tabular-nums">
                  {r.createdAt.replace("T", " ").slice(0, 19)}
                </td>
                <td className="px-3 py-2">{r.userName ?? "command line"}</td>
                <td className="px-3 py-2">
                  {r.action} · {r.entity} {r.entityId ?? ""}
                </td>
                <td className="px-3 py-2 font-mono text-xs text-ink-soft">
                  {r.detail ? JSON.stringify(r.detail) : ""}
                </td>
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={4} className="px-3 py-6 text-center text-ink-soft">
                  Nothing recorded yet.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <Pagination
        page={page}
        pageSize={PAGE_SIZE}
        total={total}
        basePath="/settings/audit"
        params={{}}
      />
    </>
  );
}
