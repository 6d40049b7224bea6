import { notFound } from "next/navigation";
import { loadImport } from "./load-import";

export default async function ImportLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ id: string }>;
}) {
  const { imp } = await loadImport((await params).id);
  if (!imp) notFound();
  return children;
}
