import type { Metadata } from "next";
import { KnownIssueForm } from "@/components/known-issues/known-issue-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { SafetyNote } from "@/components/ui/safety-note";
import { getDb } from "@/db";
import { requirePage } from "@/lib/auth/guard";
import { CellKeyQuery } from "@/lib/cell-request";
import { createKnownIssueAction } from "../actions";
import { EMPTY_VALUES, formChoices, valuesFromCell } from "../form-values";

export const metadata: Metadata = { title: "New known issue" };

export default async function NewKnownIssuePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const auth = await requirePage("known-issues:manage");
  const db = await getDb();
  const unit = auth.organisation.distanceUnit;
  const { choices, generations } = await formChoices(db, auth, unit);
  const raw = await searchParams;
  const fromCell = CellKeyQuery.safeParse(
    Object.fromEntries(Object.entries(raw).filter(([, v]) => typeof v === "string")),
  );
  const prefilled = fromCell.success
    ? await valuesFromCell(db, auth, fromCell.data, unit, generations)
    : null;
  return (
    <>
      <PageHeader
        title="New known issue"
        description={
          prefilled
            ? "Prefilled from a computed cell: check the cohort, mileage range and fault, then add the checks, the fix and the cautions."
            : "Write up a pattern your team stands behind."
        }
      />
      <Panel>
        <KnownIssueForm
          action={createKnownIssueAction}
          values={prefilled ?? EMPTY_VALUES}
          choices={choices}
          submitLabel="Create known issue"
        />
      </Panel>
      <div className="mt-4">
        <SafetyNote />
      </div>
    </>
  );
}
