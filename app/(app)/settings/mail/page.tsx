import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { PageHeader } from "@/components/ui/page-header";
import { Pagination } from "@/components/ui/pagination";
import { getDb } from "@/db";
import { listCapturedMail } from "@/db/queries/captured-mail";
import { requirePage } from "@/lib/auth/guard";
import { getMailMode } from "@/lib/env";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Captured mail" };

const Query = z.object({ page: z.coerce.number().int().min(1).catch(1).default(1) });
const PAGE_SIZE = 20;

/**
 * The HTML part is shown in a sandboxed frame (no scripts, no same origin, no navigation) under
 * a policy that loads nothing from outside: a captured message can neither run code in the app
 * nor call home.
 */
function sandboxedDocument(html: string): string {
  return `<!doctype html><meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">${html}`;
}

export default async function CapturedMailPage({
  searchParams,
}: {
  searchParams: PageSearchParams;
}) {
  const auth = await requirePage("settings:manage");
  // Only where mail goes to the local capture (demo mode, development) is there anything here.
  if (getMailMode().kind !== "capture") notFound();
  const { page } = Query.parse(await queryValues(searchParams));
  const { rows, total } = await listCapturedMail(await getDb(), auth, {
    page,
    pageSize: PAGE_SIZE,
  });
  return (
    <>
      <PageHeader
        title="Captured mail"
        description={
          <>
            No mail server is configured, so the e-mail that {auth.organisation.name} sends is
            caught by Recurra&apos;s local SMTP capture instead of going out. Set{" "}
            <code className="font-mono">SMTP_URL</code> to send it for real.
          </>
        }
        actions={<Link href="/settings">← Settings</Link>}
      />
      {rows.length === 0 ? (
        <p className="rounded-lg border border-line bg-panel p-6 text-ink-soft">
          Nothing captured yet. Invitations and other mail appear here a moment after they are sent.
        </p>
      ) : (
        <ol className="space-y-3" aria-label="Captured messages">
          {rows.map((m) => (
            <li key={m.id} className="rounded-lg border border-line bg-panel">
              <details>
                <summary className="cursor-pointer px-4 py-3">
                  <span className="font-medium">{m.subject || "(no subject)"}</span>
                  <span className="block text-sm text-ink-soft">
                    To {m.toAddresses} · {m.createdAt.slice(0, 19).replace("T", " ")} UTC
                  </span>
                </summary>
                <div className="space-y-3 border-t border-line px-4 py-3 text-sm">
                  <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1">
                    <dt className="text-ink-soft">From</dt>
                    <dd>{m.fromAddress}</dd>
                    <dt className="text-ink-soft">To</dt>
                    <dd>{m.toAddresses}</dd>
                    <dt className="text-ink-soft">Size</dt>
                    <dd>{m.sizeBytes.toLocaleString("en-GB")} bytes</dd>
                  </dl>
                  <section aria-label="Text part">
                    <h2 className="mb-1 text-sm font-medium">Text</h2>
                    <pre
                      data-testid="mail-text"
                      className="overflow-x-auto whitespace-pre-wrap rounded-md bg-paper p-3 font-mono text-xs"
                    >
                      {m.textBody ?? "(no text part)"}
                    </pre>
                  </section>
                  {m.htmlBody ? (
                    <section aria-label="HTML part">
                      <h2 className="mb-1 text-sm font-medium">HTML</h2>
                      <iframe
                        title={`HTML part of “${m.subject}”`}
                        sandbox=""
                        referrerPolicy="no-referrer"
                        srcDoc={sandboxedDocument(m.htmlBody)}
                        className="h-72 w-full rounded-md border border-line bg-white"
                      />
                    </section>
                  ) : null}
                </div>
              </details>
            </li>
          ))}
        </ol>
      )}
      <Pagination
        page={page}
        pageSize={PAGE_SIZE}
        total={total}
        basePath="/settings/mail"
        params={{}}
      />
    </>
  );
}
