/** Cautions for a piece of work, each with its title; an empty list says the general note applies. */
export function CautionList({
  cautions,
  className = "",
}: {
  cautions: readonly { kind: string; title: string; text: string }[];
  className?: string;
}) {
  return (
    <div className={className} data-testid="cautions">
      {cautions.length === 0 ? (
        <p className="text-sm">No specific caution listed: the general safety note applies.</p>
      ) : (
        <ul className="space-y-1 text-sm">
          {cautions.map((k) => (
            <li
              key={`${k.kind}-${k.title}`}
              data-caution={k.kind}
              className="border-l-4 border-ochre-500 pl-2"
            >
              <strong>{k.title}:</strong> {k.text}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
