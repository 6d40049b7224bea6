import type { Metadata } from "next";
import { DigestToggle } from "@/components/account/digest-toggle";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getDigestOptIn } from "@/db/queries/preferences";
import { DIGEST_CRON } from "@/jobs/digest/schedule";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const auth = await requirePage("dashboard:read");
  const wants = await getDigestOptIn(await getDb(), auth);
  return (
    <>
      <PageHeader title="Account" description={`Your preferences in ${auth.organisation.name}.`} />
      <Panel title="Weekly digest">
        <p className="text-sm">
          Once a week (schedule <code>{DIGEST_CRON}</code>, UTC) an e-mail with the new signals,
          known issues that changed state, the top comebacks and the vehicles most at risk.
        </p>
        <DigestToggle wants={wants} />
      </Panel>
    </>
  );
}
