import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { KnownIssueForm } from "@/components/known-issues/known-issue-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getKnownIssue } from "@/db/queries/known-issues";
import { requirePage } from "@/lib/auth/guard";
import { updateKnownIssueAction } from "../../actions";
import { formChoices, valuesFromIssue } from "../../form-values";
import { IssueId } from "../issue-id";

export const metadata: Metadata = { title: "Edit known issue" };

export default async function EditKnownIssuePage({ params }: { params: Promise<{ id: string }> }) {
  const auth = await requirePage("known-issues:manage");
  const id = IssueId.safeParse((await params).id);
  if (!id.success) notFound();
  const db = await getDb();
  const issue = await getKnownIssue(db, auth, id.data);
  if (!issue) notFound();
  const unit = auth.organisation.distanceUnit;
  const { choices } = await formChoices(db, auth, unit);
  return (
    <>
      <PageHeader title={`Edit: ${issue.title}`} />
      <Panel>
        <KnownIssueForm
          action={updateKnownIssueAction}
          values={valuesFromIssue(issue, unit)}
          choices={choices}
          submitLabel="Save changes"
        />
      </Panel>
    </>
  );
}
