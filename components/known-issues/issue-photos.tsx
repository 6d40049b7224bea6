import { Panel } from "@/components/ui/panel";
import type { KnownIssueDetail } from "@/db/queries/known-issues";
import { ATTACHMENT_MAX_BYTES } from "@/lib/known-issues";
import { AttachmentUpload } from "./issue-forms";

/** The known issue's photos, and the upload for those who may comment. */
export function IssuePhotos({
  issue,
  mayComment,
}: {
  issue: Pick<KnownIssueDetail, "id" | "attachments">;
  mayComment: boolean;
}) {
  return (
    <Panel title="Photos">
      {issue.attachments.length === 0 ? (
        <p className="text-sm text-ink-soft">No photos yet.</p>
      ) : (
        <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3">
          {issue.attachments.map((a) => (
            <li key={a.id} className="text-xs text-ink-soft">
              <a href={`/api/known-issues/attachments/${a.id}`}>
                {/* eslint-disable-next-line @next/next/no-img-element -- served by an auth-checked route */}
                <img
                  src={`/api/known-issues/attachments/${a.id}`}
                  alt={`Photo: ${a.fileName}`}
                  className="h-32 w-full rounded border border-line object-cover"
                />
              </a>
              {a.fileName} · {a.uploadedBy ?? "someone"}
            </li>
          ))}
        </ul>
      )}
      {mayComment ? (
        <AttachmentUpload knownIssueId={issue.id} maxMb={ATTACHMENT_MAX_BYTES / 1_048_576} />
      ) : null}
    </Panel>
  );
}
