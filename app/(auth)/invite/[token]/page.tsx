import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { Wordmark } from "@/components/brand/logo";
import { CreateAccountForm, JoinForm } from "@/components/invitations/accept-forms";
import { SignOutButton } from "@/components/shell/sign-out-button";
import { getDb } from "@/db";
import { closedInvitationMessage, findInvitationByToken } from "@/db/queries/invitation-accept";
import { getAuthState } from "@/lib/auth/guard";
import { MIN_PASSWORD_LENGTH } from "@/lib/auth/password";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "@/lib/auth/roles";

export const metadata: Metadata = { title: "Invitation", referrer: "no-referrer" };

// Anything that is not a plausible token is simply an unknown link.
const Params = z.object({ token: z.string().max(200).catch("") });

function Card({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <div className="w-full max-w-md">
      <div className="mb-6 flex justify-center">
        <Wordmark />
      </div>
      <div className="rounded-lg border border-line bg-panel p-6 shadow-sm">
        <h1 className="text-xl">{title}</h1>
        {children}
      </div>
    </div>
  );
}

/** The link in an invitation e-mail: outside the signed-in area, the token is the authority. */
export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = Params.parse(await params);
  const [invitation, state] = await Promise.all([
    findInvitationByToken(await getDb(), token),
    getAuthState(),
  ]);
  if (invitation.status !== "open") {
    return (
      <Card title="This invitation cannot be used">
        <p role="alert" className="mt-3 rounded-md bg-sea-50 px-3 py-2 text-sm text-ink">
          {closedInvitationMessage(invitation.status, invitation.organisationName)}
        </p>
        <p className="mt-4 text-sm">
          <Link href="/sign-in">Go to sign-in</Link>
        </p>
      </Card>
    );
  }
  const user =
    state.status === "signed-in"
      ? state.auth.user
      : state.status === "no-organisation"
        ? state.user
        : null;
  const nextPath = `/invite/${token}`;
  return (
    <Card title={`Join ${invitation.organisationName}`}>
      <p className="mt-2 text-sm text-ink-soft">
        You are invited as <strong className="text-ink">{ROLE_LABELS[invitation.role]}</strong>:{" "}
        {ROLE_DESCRIPTIONS[invitation.role]} The invitation is for{" "}
        <strong className="text-ink">{invitation.email}</strong> and works until{" "}
        {invitation.expiresAt.slice(0, 16).replace("T", " ")} UTC.
      </p>
      {user && user.email === invitation.email ? (
        <JoinForm
          token={token}
          organisationId={invitation.organisationId}
          organisationName={invitation.organisationName}
        />
      ) : user ? (
        <div className="mt-4 space-y-3 text-sm">
          <p role="alert" className="rounded-md bg-alarm-100 px-3 py-2 text-alarm-700">
            You are signed in as {user.email}, but this invitation is for {invitation.email}. Sign
            out, then open the link again.
          </p>
          <SignOutButton />
        </div>
      ) : invitation.hasAccount ? (
        <div className="mt-4 space-y-3 text-sm">
          <p>
            There is already a Recurra account for {invitation.email}. Sign in with it to join{" "}
            {invitation.organisationName}.
          </p>
          <Link
            href={`/sign-in?next=${encodeURIComponent(nextPath)}`}
            className="inline-block rounded-md bg-sea-700 px-4 py-2 font-medium text-white no-underline hover:bg-sea-800 hover:no-underline"
          >
            Sign in to join
          </Link>
        </div>
      ) : (
        <CreateAccountForm
          token={token}
          email={invitation.email}
          minPasswordLength={MIN_PASSWORD_LENGTH}
        />
      )}
    </Card>
  );
}
