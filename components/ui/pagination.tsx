import Link from "next/link";

/** Previous / next links that keep the other URL parameters. */
export function Pagination({
  page,
  pageSize,
  total,
  basePath,
  params,
}: {
  page: number;
  pageSize: number;
  total: number;
  basePath: string;
  params: Record<string, string | undefined>;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const href = (p: number) => {
    const q = new URLSearchParams();
    for (const [k, v] of Object.entries(params)) if (v) q.set(k, v);
    q.set("page", String(p));
    return `${basePath}?${q.toString()}`;
  };
  return (
    <nav aria-label="Pages" className="mt-4 flex items-center gap-4 text-sm">
      {page > 1 ? (
        <Link href={href(page - 1)}>← Previous</Link>
      ) : (
        <span className="text-ink-soft">← Previous</span>
      )}
      <span className="text-ink-soft">
        Page {page} of {pages} · {total.toLocaleString("en-GB")} in all
      </span>
      {page < pages ? (
        <Link href={href(page + 1)}>Next →</Link>
      ) : (
        <span className="text-ink-soft">Next →</span>
      )}
    </nav>
  );
}
