import { notFound } from "next/navigation";
import { loadPart } from "./load-part";

export default async function PartLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ id: string }>;
}) {
  const { part } = await loadPart((await params).id);
  if (!part) notFound();
  return children;
}
