import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ImportDetail } from "@/components/imports/import-detail";
import { KIND_LABELS } from "@/components/imports/kinds";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/roles";
import { loadImport } from "./load-import";

export const metadata: Metadata = { title: "Import" };

export default async function ImportPage({ params }: { params: Promise<{ id: string }> }) {
  const { auth, imp } = await loadImport((await params).id);
  if (!imp) notFound();
  return (
    <>
      <PageHeader
        title={imp.fileName}
        description={`${KIND_LABELS[imp.kind]} · ${imp.sizeBytes < 1_048_576 ? `${Math.max(1, Math.round(imp.sizeBytes / 1024))} kB` : `${(imp.sizeBytes / 1_048_576).toFixed(1)} MB`} · uploaded ${imp.createdAt.slice(0, 16).replace("T", " ")} UTC by ${imp.createdByName ?? "the command line"}`}
        actions={<Link href="/imports">← All imports</Link>}
      />
      <ImportDetail importId={imp.id} kind={imp.kind} canWrite={can(auth.role, "imports:write")} />
    </>
  );
}
