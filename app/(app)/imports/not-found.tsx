import Link from "next/link";

export default function ImportNotFound() {
  return (
    <div className="rounded-lg border border-line bg-panel p-6">
      <h1 className="text-xl">Import not found</h1>
      <p className="mt-2 text-ink-soft">There is no such import in this organisation.</p>
      <Link href="/imports" className="mt-4 inline-block">
        All imports
      </Link>
    </div>
  );
}
