"use client";

export default function GlobalError({
  reset,
}: {
  error: Error & { digest?: string };
  reset: () => void;
}) {
  return (
    <html lang="en-GB">
      <body
        style={{ fontFamily: "system-ui, sans-serif", background: "#f5f3ee", color: "#1c2830" }}
      >
        <main style={{ maxWidth: 520, margin: "96px auto", padding: 24 }}>
          <h1>Recurra could not load</h1>
          <p>Something went wrong on our side. It has been logged. Your data is safe.</p>
          <button type="button" onClick={reset}>
            Try again
          </button>
        </main>
      </body>
    </html>
  );
}
