import type { Metadata } from "next";
import Link from "next/link";
import { ComponentKindForm } from "@/components/settings/component-kind-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { countLinesByComponent, listComponentKinds } from "@/db/queries/component-kinds";
import { requirePage } from "@/lib/auth/guard";
import { COMPONENT_KINDS, KIND_LABELS, KIND_MEANINGS } from "@/lib/component-kinds";
import { countOf } from "@/lib/plain-words";

export const metadata: Metadata = { title: "Components" };

export default async function ComponentsPage() {
  const auth = await requirePage("settings:manage");
  const db = await getDb();
  const [list, lines] = await Promise.all([
    listComponentKinds(db, auth),
    countLinesByComponent(db, auth),
  ]);
  const systems = [...new Set(list.map((c) => c.system))];
  return (
    <>
      <PageHeader
        title="Components"
        description="What kind of work each component stands for. Changing a kind classifies your repair lines again and recomputes the statistics; every change is in the audit log."
        actions={<Link href="/settings">← Settings</Link>}
      />
      <Panel title="The three kinds">
        <dl className="grid gap-2 text-sm sm:grid-cols-3">
          {COMPONENT_KINDS.map((k) => (
            <div key={k}>
              <dt className="font-semibold">{KIND_LABELS[k]}</dt>
              <dd className="text-ink-soft">{KIND_MEANINGS[k]}</dd>
            </div>
          ))}
        </dl>
        <p className="mt-3 text-sm text-ink-soft">
          A failure component replaced by the schedule (no complaint, no code, and words such as
          “per interval” or “scheduled”) counts as scheduled service on that line.
        </p>
      </Panel>
      {systems.map((system) => (
        <Panel key={system} title={system} className="mt-4">
          <table className="w-full text-left text-sm">
            <thead className="text-ink-soft">
              <tr>
                <th className="py-1 pr-3 font-medium">Component</th>
                <th className="py-1 pr-3 font-medium">Your repair lines</th>
                <th className="py-1 font-medium">Kind</th>
              </tr>
            </thead>
            <tbody>
              {list
                .filter((c) => c.system === system)
                .map((c) => {
                  const counts = lines.get(c.id);
                  const total = counts ? counts.service + counts.wear + counts.failure : 0;
                  return (
                    <tr key={c.slug} className="border-t border-line/60 align-top">
                      <td className="py-2 pr-3">
                        {c.name}
                        {c.kind !== c.defaultKind ? (
                          <span className="block text-xs text-ink-soft">
                            Your choice; Recurra&rsquo;s default is{" "}
                            {KIND_LABELS[c.defaultKind].toLowerCase()}.
                          </span>
                        ) : null}
                      </td>
                      <td className="py-2 pr-3 tabular-nums">
                        {total === 0 ? "none" : countOf(total, "line")}
                      </td>
                      <td className="py-2">
                        <ComponentKindForm slug={c.slug} name={c.name} kind={c.kind} />
                      </td>
                    </tr>
                  );
                })}
            </tbody>
          </table>
        </Panel>
      ))}
    </>
  );
}
