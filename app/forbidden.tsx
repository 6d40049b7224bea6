import Link from "next/link";
import { LogoMark } from "@/components/brand/logo";

export default function Forbidden() {
  return (
    <main className="mx-auto mt-24 max-w-lg rounded-lg border border-line bg-panel p-8">
      <LogoMark size={36} />
      <p className="mt-4 text-sm font-semibold text-alarm-700">403 · Not allowed</p>
      <h1 className="mt-1 text-2xl">Your role cannot open this page</h1>
      <p className="mt-2 text-ink-soft">
        Ask an admin of your organisation if you need access. Nothing has been changed.
      </p>
      <Link href="/" className="mt-4 inline-block">
        Go to Recurra home
      </Link>
    </main>
  );
}
