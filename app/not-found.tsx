import Link from "next/link";
import { LogoMark } from "@/components/brand/logo";

export default function NotFound() {
  return (
    <main className="mx-auto mt-24 max-w-lg rounded-lg border border-line bg-panel p-8">
      <LogoMark size={36} />
      <h1 className="mt-4 text-2xl">Page not found</h1>
      <p className="mt-2 text-ink-soft">There is no page at this address.</p>
      <Link href="/" className="mt-4 inline-block">
        Go to Recurra home
      </Link>
    </main>
  );
}
