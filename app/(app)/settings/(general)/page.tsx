import type { Metadata } from "next";
import Link from "next/link";
import { SettingsForm } from "@/components/settings/settings-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getOrganisation, listMembers } from "@/db/queries/organisations";
import { requirePage } from "@/lib/auth/guard";
import { getMailMode } from "@/lib/env";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const auth = await requirePage("settings:manage");
  const db = await getDb();
  const [org, members] = await Promise.all([getOrganisation(db, auth), listMembers(db, auth)]);
  const isMailCaptured = getMailMode().kind === "capture";
  return (
    <>
      <PageHeader
        title="Settings"
        description={`Organisation, members and analysis settings of ${org.name}.`}
        actions={
          <>
            <Link href="/settings/members">Members →</Link>
            <Link href="/settings/components">Components →</Link>
            {isMailCaptured ? <Link href="/settings/mail">Captured mail →</Link> : null}
            <Link href="/settings/audit">Audit log →</Link>
          </>
        }
      />
      <Panel title="Organisation">
        <SettingsForm
          values={{
            name: org.name,
            distanceUnit: org.distanceUnit,
            bandWidth: org.bandWidth,
            comebackDays: org.comebackDays,
            comebackDistance: org.comebackDistance,
            refuelWindow: org.refuelWindow,
            confidenceLevel: org.confidenceLevel,
            minExposure: org.minExposure,
            uploadLimitMb: org.uploadLimitMb,
          }}
        />
      </Panel>
      <Panel title="Members and roles" className="mt-4">
        <p className="text-sm">
          {members.length} {members.length === 1 ? "member" : "members"}.{" "}
          <Link href="/settings/members">Manage members and invitations →</Link>
        </p>
      </Panel>
    </>
  );
}
