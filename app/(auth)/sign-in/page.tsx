import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { z } from "zod";
import { Wordmark } from "@/components/brand/logo";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "@/db/seed/demo/accounts";
import { getAuthState } from "@/lib/auth/guard";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { getEnv } from "@/lib/env";
import { SignInForm } from "./sign-in-form";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Sign in" };

const Reason = z.enum(["expired", "signed-out", "no-organisation"]).optional().catch(undefined);

/** Where to go after signing in: a path inside the app only (never another site). */
const Next = z
  .string()
  .max(500)
  .regex(/^\/(?![/\\])[^\s]*$/)
  .optional()
  .catch(undefined);

const NOTICES: Record<NonNullable<z.infer<typeof Reason>>, string> = {
  expired: "Your session has ended. Sign in again to carry on.",
  "signed-out": "You have signed out.",
  "no-organisation":
    "Your account is not a member of any organisation. Ask an admin to invite you.",
};

export default async function SignInPage({ searchParams }: { searchParams: PageSearchParams }) {
  const query = await queryValues(searchParams);
  const reason = Reason.parse(query.reason);
  const next = Next.parse(query.next);
  const state = await getAuthState();
  if (state.status === "signed-in") redirect(next ?? "/");
  const isDemo = getEnv().RECURRA_DEMO;
  return (
    <div className="w-full max-w-md">
      <div className="mb-6 flex justify-center">
        <Wordmark />
      </div>
      <div className="rounded-lg border border-line bg-panel p-6 shadow-sm">
        <h1 className="text-xl">Sign in</h1>
        <p className="mt-1 text-sm text-ink-soft">
          Recurring failures across your fleet or your customers&apos; vehicles.
        </p>
        {reason ? (
          <p role="status" className="mt-4 rounded-md bg-sea-50 px-3 py-2 text-sm text-ink">
            {NOTICES[reason]}
          </p>
        ) : null}
        <SignInForm next={next ?? "/"} />
      </div>
      {isDemo ? (
        <section
          aria-labelledby="demo-accounts"
          className="mt-6 rounded-lg border border-dashed border-line-strong bg-panel/60 p-5 text-sm"
        >
          <h2 id="demo-accounts" className="text-base">
            Demo accounts
          </h2>
          <p className="mt-1 text-ink-soft">
            Demo mode: invented organisations and data. Password for every account:{" "}
            <code className="font-mono text-ink">{DEMO_PASSWORD}</code>
          </p>
          <ul className="mt-3 space-y-1">
            {DEMO_ACCOUNTS.map((a) => (
              <li key={a.email} className="flex flex-wrap justify-between gap-2">
                <code className="font-mono">{a.email}</code>
                <span className="text-ink-soft">
                  {ROLE_LABELS[a.role]} · {a.organisations.join(", ")}
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
