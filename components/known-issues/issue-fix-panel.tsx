import { Panel } from "@/components/ui/panel";
import type { KnownIssueDetail } from "@/db/queries/known-issues";
import type { FixHeld } from "@/lib/fix-held";
import { FixHeldFigure } from "./fix-held-figure";

/** The fix that held: what to do, its hours and parts, and how often it held. */
export function IssueFixPanel({
  issue,
  fixHeld,
  unit,
}: {
  issue: Pick<KnownIssueDetail, "fixDescription" | "laborOperation" | "typicalHours" | "parts">;
  fixHeld: FixHeld | null;
  unit: "mi" | "km";
}) {
  const th = "py-1 pr-3 font-medium";
  return (
    <Panel title="The fix that held">
      <p className="whitespace-pre-line">{issue.fixDescription ?? "Not written yet."}</p>
      <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-soft">Labour operation</dt>
        <dd>{issue.laborOperation ?? "—"}</dd>
        <dt className="text-ink-soft">Typical hours</dt>
        <dd className="tabular-nums">{issue.typicalHours ?? "—"}</dd>
        <dt className="text-ink-soft">How often it held</dt>
        <dd>
          <FixHeldFigure fixHeld={fixHeld} unit={unit} />
        </dd>
      </dl>
      {issue.parts.length > 0 ? (
        <table className="mt-3 w-full text-left text-sm">
          <caption className="sr-only">Parts</caption>
          <thead className="text-ink-soft">
            <tr>
              <th scope="col" className={th}>
                Part number
              </th>
              <th scope="col" className={th}>
                Description
              </th>
              <th scope="col" className={`${th} text-right`}>
                Quantity
              </th>
              <th scope="col" className="py-1 text-right font-medium">
                On hand
              </th>
            </tr>
          </thead>
          <tbody>
            {issue.parts.map((p) => (
              <tr key={p.partNumber} className="border-t border-line/60">
                <td className="py-1 pr-3 font-mono text-[13px]">{p.partNumber}</td>
                <td className="py-1 pr-3">{p.description ?? "not in the parts list"}</td>
                <td className="py-1 pr-3 text-right tabular-nums">{p.quantity}</td>
                <td className="py-1 text-right tabular-nums">{p.onHand ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </Panel>
  );
}
