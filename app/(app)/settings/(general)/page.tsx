import type { Metadata } from "next";
import Link from "next/link";
import { MemberRoleForm } from "@/components/settings/member-role-form";
import { SettingsForm } from "@/components/settings/settings-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getOrganisation, listMembers } from "@/db/queries/organisations";
import { requirePage } from "@/lib/auth/guard";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "@/lib/auth/roles";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const auth = await requirePage("settings:manage");
  const db = await getDb();
  const [org, members] = await Promise.all([getOrganisation(db, auth), listMembers(db, auth)]);
  return (
    <>
      <PageHeader
        title="Settings"
        description={`Organisation, members and analysis settings of ${org.name}.`}
        actions={<Link href="/settings/audit">Audit log →</Link>}
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
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-ink-soft">
              <tr>
                <th className="py-1 pr-3 font-medium">Name</th>
                <th className="py-1 pr-3 font-medium">E-mail</th>
                <th className="py-1 pr-3 font-medium">Role</th>
              </tr>
            </thead>
            <tbody>
              {members.map((m) => (
                <tr key={m.membershipId} className="border-t border-line/60">
                  <td className="py-2 pr-3">{m.name}</td>
                  <td className="py-2 pr-3">{m.email}</td>
                  <td className="py-2 pr-3">
                    <MemberRoleForm membershipId={m.membershipId} role={m.role} name={m.name} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <dl className="mt-4 grid gap-1 text-sm sm:grid-cols-2">
          {Object.entries(ROLE_DESCRIPTIONS).map(([role, text]) => (
            <div key={role}>
              <dt className="inline font-medium">
                {ROLE_LABELS[role as keyof typeof ROLE_LABELS]}:{" "}
              </dt>
              <dd className="inline text-ink-soft">{text}</dd>
            </div>
          ))}
        </dl>
        <p className="mt-3 text-sm text-ink-soft">
          Invitations by e-mail come with the known-issue work; until then add members with{" "}
          <code className="font-mono">npm run recurra -- user add</code>.
        </p>
      </Panel>
    </>
  );
}
