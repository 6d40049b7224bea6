import type { Metadata } from "next";
import { ImportHistory } from "@/components/imports/import-history";
import { UploadPanel } from "@/components/imports/upload-panel";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getOrganisation } from "@/db/queries/organisations";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";

export const metadata: Metadata = { title: "Imports" };

export default async function ImportsPage() {
  const auth = await requirePage("imports:read");
  const org = await getOrganisation(await getDb(), auth);
  return (
    <>
      <PageHeader
        title="Imports"
        description="Repair orders, fault codes, fill-ups, rosters, parts and generations in from CSV. Every import lands whole or not at all, keeps its original file, and can be undone."
      />
      {can(auth.role, "imports:write") ? (
        <Panel title="New import" className="mb-6">
          <UploadPanel limitMb={org.uploadLimitMb} />
        </Panel>
      ) : null}
      <h2 className="mb-3 text-lg">History</h2>
      <ImportHistory />
    </>
  );
}
