import Link from "next/link";

export default function AppNotFound() {
  return (
    <div className="rounded-lg border border-line bg-panel p-6">
      <h1 className="text-xl">Not found</h1>
      <p className="mt-2 text-ink-soft">
        There is no such record in this organisation. It may have been removed, or the link may
        belong to another organisation.
      </p>
      <Link href="/" className="mt-4 inline-block">
        Back to home
      </Link>
    </div>
  );
}
