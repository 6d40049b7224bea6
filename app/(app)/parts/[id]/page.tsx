import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import {
  CountPartsForm,
  DeletePartForm,
  EditPartForm,
  ReceivePartsForm,
} from "@/components/parts/part-forms";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { listComponentChoices } from "@/db/queries/parts";
import { formatMoney } from "@/lib/format";
import { describePartChange } from "@/lib/part-changes";
import { loadPart } from "./load-part";

export const metadata: Metadata = { title: "Part" };

export default async function PartPage({ params }: { params: Promise<{ id: string }> }) {
  const { auth, part } = await loadPart((await params).id);
  if (!part) notFound();
  const choices = await listComponentChoices(await getDb(), auth);
  const facts: [string, React.ReactNode][] = [
    [
      "On hand",
      <span key="on-hand" data-testid="on-hand">
        {part.onHand.toLocaleString("en-GB")}
      </span>,
    ],
    ["Unit cost", part.unitCostCents === null ? "not known" : formatMoney(part.unitCostCents)],
    ["Lead time", part.leadTimeDays === null ? "the plan's default" : `${part.leadTimeDays} days`],
    ["Component", part.component ?? "not filed under a component"],
    ["Added", `${part.createdAt.slice(0, 10)}${part.importId ? " (by an import)" : ""}`],
  ];
  return (
    <>
      <PageHeader
        title={`Part ${part.partNumber}`}
        description={part.description}
        actions={
          <Link href="/parts" className="text-sm">
            ← All parts
          </Link>
        }
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <Panel title="On the list">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            {facts.map(([term, value]) => (
              <div key={term} className="contents">
                <dt className="text-ink-soft">{term}</dt>
                <dd className="tabular-nums">{value}</dd>
              </div>
            ))}
          </dl>
        </Panel>
        <Panel title="Stock">
          <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-1">
            <ReceivePartsForm partId={part.id} />
            <CountPartsForm partId={part.id} />
          </div>
        </Panel>
        <Panel title="Recent changes">
          {part.changes.length === 0 ? (
            <p className="text-sm text-ink-soft">No changes since it was added.</p>
          ) : (
            <ol className="space-y-1 text-sm" aria-label="Recent changes">
              {part.changes.map((c, i) => (
                <li key={i}>
                  <span className="text-ink-soft">
                    {c.createdAt.slice(0, 16).replace("T", " ")} · {c.userName ?? "system"}:
                  </span>{" "}
                  {describePartChange(c.action, c.detail)}
                </li>
              ))}
            </ol>
          )}
        </Panel>
      </div>
      <Panel title="Details" className="mt-4">
        <EditPartForm
          partId={part.id}
          choices={choices}
          initial={{
            description: part.description,
            componentSlug: part.componentSlug,
            unitCost: part.unitCostCents === null ? "" : (part.unitCostCents / 100).toFixed(2),
            leadTimeDays: part.leadTimeDays,
          }}
        />
      </Panel>
      <Panel title="Remove" className="mt-4">
        <DeletePartForm partId={part.id} />
      </Panel>
    </>
  );
}
