/** A bordered section; with a title it is a named region (its heading labels it). */
export function Panel({
  title,
  children,
  className = "",
}: {
  title?: string;
  children: React.ReactNode;
  className?: string;
}) {
  const headingId = title ? `panel-${title.toLowerCase().replace(/[^a-z0-9]+/g, "-")}` : undefined;
  return (
    <section
      aria-labelledby={headingId}
      className={`rounded-lg border border-line bg-panel p-5 ${className}`}
    >
      {title ? (
        <h2 id={headingId} className="mb-3 text-base text-ink">
          {title}
        </h2>
      ) : null}
      {children}
    </section>
  );
}
