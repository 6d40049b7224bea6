import type { Metadata } from "next";
import Link from "next/link";
import { ConfirmActionForm } from "@/components/settings/confirm-action-form";
import { InviteForm } from "@/components/settings/invite-form";
import { MemberRoleForm } from "@/components/settings/member-role-form";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { listOpenInvitations } from "@/db/queries/invitations";
import { listMembers } from "@/db/queries/organisations";
import { requirePage } from "@/lib/auth/guard";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "@/lib/auth/roles";
import { INVITATION_DAYS } from "@/lib/invitation-token";
import { removeMemberAction, revokeInvitationAction } from "./actions";

export const metadata: Metadata = { title: "Members" };

const when = (iso: string) => `${iso.slice(0, 16).replace("T", " ")}`;

export default async function MembersPage() {
  const auth = await requirePage("members:manage");
  const db = await getDb();
  const [members, invitations] = await Promise.all([
    listMembers(db, auth),
    listOpenInvitations(db, auth),
  ]);
  return (
    <>
      <PageHeader
        title="Members"
        description={`Who works in ${auth.organisation.name}, with which role, and who has been invited.`}
        actions={<Link href="/settings">← Settings</Link>}
      />
      <Panel title="Invite by e-mail">
        <p className="mb-3 text-sm text-ink-soft">
          The invitation link works once, for {INVITATION_DAYS} days. Someone without an account
          creates one; someone with an account signs in and joins.
        </p>
        <InviteForm />
      </Panel>

      <Panel title="Pending invitations" className="mt-4">
        {invitations.length === 0 ? (
          <p className="text-sm text-ink-soft">No invitations waiting.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="text-ink-soft">
                <tr>
                  <th className="py-1 pr-3 font-medium">E-mail</th>
                  <th className="py-1 pr-3 font-medium">Role</th>
                  <th className="py-1 pr-3 font-medium">Invited by</th>
                  <th className="py-1 pr-3 font-medium">Sent (UTC)</th>
                  <th className="py-1 pr-3 font-medium">Expires (UTC)</th>
                  <th className="py-1 pr-3 font-medium">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {invitations.map((i) => (
                  <tr key={i.id} className="border-t border-line/60">
                    <td className="py-2 pr-3">{i.email}</td>
                    <td className="py-2 pr-3">{ROLE_LABELS[i.role]}</td>
                    <td className="py-2 pr-3">{i.invitedBy ?? "—"}</td>
                    <td className="py-2 pr-3 tabular-nums">{when(i.createdAt)}</td>
                    <td className="py-2 pr-3 tabular-nums">
                      {i.status === "expired" ? (
                        <span className="font-medium text-alarm-700">
                          expired {when(i.expiresAt)}
                        </span>
                      ) : (
                        when(i.expiresAt)
                      )}
                    </td>
                    <td className="py-2 pr-3">
                      <ConfirmActionForm
                        action={revokeInvitationAction}
                        fields={{ invitationId: i.id }}
                        label="Revoke"
                        accessibleLabel={`Revoke the invitation to ${i.email}`}
                        question="Revoke this invitation?"
                      />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      <Panel title="Members and roles" className="mt-4">
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-ink-soft">
              <tr>
                <th className="py-1 pr-3 font-medium">Name</th>
                <th className="py-1 pr-3 font-medium">E-mail</th>
                <th className="py-1 pr-3 font-medium">Role</th>
                <th className="py-1 pr-3 font-medium">
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {members.map((m) => (
                <tr key={m.membershipId} className="border-t border-line/60">
                  <td className="py-2 pr-3">
                    {m.name}
                    {m.userId === auth.userId ? (
                      <span className="text-ink-soft"> (you)</span>
                    ) : null}
                  </td>
                  <td className="py-2 pr-3">{m.email}</td>
                  <td className="py-2 pr-3">
                    <MemberRoleForm membershipId={m.membershipId} role={m.role} name={m.name} />
                  </td>
                  <td className="py-2 pr-3">
                    <ConfirmActionForm
                      action={removeMemberAction}
                      fields={{ membershipId: m.membershipId }}
                      label="Remove"
                      accessibleLabel={`Remove ${m.name}`}
                      question={`Remove ${m.name} from ${auth.organisation.name}?`}
                    />
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
          An organisation always keeps at least one admin: the last one can be neither demoted nor
          removed.
        </p>
      </Panel>
    </>
  );
}
