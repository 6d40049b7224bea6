"use client";

import { buttonClass } from "@/components/ui/button";

export default function AppError({
  reset,
}: {
  error: Error & { digest?: string };
  reset: () => void;
}) {
  return (
    <div role="alert" className="rounded-lg border border-alarm-700/30 bg-alarm-100 p-6">
      <h1 className="text-xl text-alarm-700">This page could not be shown</h1>
      <p className="mt-2 text-ink">
        Something went wrong on our side while loading it. It has been logged. Your data is safe.
      </p>
      <button type="button" onClick={reset} className={`${buttonClass.secondary} mt-4`}>
        Try again
      </button>
    </div>
  );
}
