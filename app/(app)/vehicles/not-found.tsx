import Link from "next/link";

export default function VehicleNotFound() {
  return (
    <div className="rounded-lg border border-line bg-panel p-6">
      <h1 className="text-xl">Vehicle not found</h1>
      <p className="mt-2 text-ink-soft">
        There is no such vehicle in this organisation. If the link came from a colleague in another
        organisation, switch organisation first.
      </p>
      <Link href="/vehicles" className="mt-4 inline-block">
        All vehicles
      </Link>
    </div>
  );
}
