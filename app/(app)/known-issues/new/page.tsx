import type { Metadata } from "next";
import { KnownIssueForm } from "@/components/known-issues/known-issue-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { SafetyNote } from "@/components/ui/safety-note";
import { getDb } from "@/db";
import { requirePage } from "@/lib/auth/guard";
import { CellKeyQuery } from "@/lib/cell-request";
import { createKnownIssueAction } from "../actions";
import { RefuelPageQuery } from "@/lib/refuel-request";
import { EMPTY_VALUES, formChoices, valuesFromCell, valuesFromRefuel } from "../form-values";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "New known issue" };

export default async function NewKnownIssuePage({
  searchParams,
}: {
  searchParams: PageSearchParams;
}) {
  const auth = await requirePage("known-issues:manage");
  const db = await getDb();
  const unit = auth.organisation.distanceUnit;
  const { choices, generations } = await formChoices(db, auth, unit);
  const raw = await queryValues(searchParams);
  const fromCell = CellKeyQuery.safeParse(raw);
  const fromRefuel = RefuelPageQuery.safeParse(raw);
  const prefilled =
    raw.source === "refuel"
      ? fromRefuel.success && fromRefuel.data.cohort && fromRefuel.data.window
        ? await valuesFromRefuel(
            db,
            auth,
            {
              cohort: fromRefuel.data.cohort,
              window: fromRefuel.data.window,
              symptom: fromRefuel.data.symptom,
            },
            unit,
            generations,
          )
        : null
      : fromCell.success
        ? await valuesFromCell(db, auth, fromCell.data, unit, generations)
        : null;
  return (
    <>
      <PageHeader
        title="New known issue"
        description={
          prefilled
            ? raw.source === "refuel"
              ? "Prefilled from the refuel analysis: check the cohort and symptoms, then add the mileage range, codes, checks, the fix and the cautions."
              : "Prefilled from a computed cell: check the cohort, mileage range and fault, then add the checks, the fix and the cautions."
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
