import { FigureDetails } from "@/components/ui/figure-details";
import { describeFixHeld, fixHeldDetails, type FixHeld } from "@/lib/fix-held";

/**
 * How often the fix held, in words, with its method one click away: the same figure on the
 * known issue's page and in the lookup (lib/fix-held.ts, db/queries/fix-held.ts).
 */
export function FixHeldFigure({ fixHeld, unit }: { fixHeld: FixHeld | null; unit: "mi" | "km" }) {
  return (
    <div data-testid="fix-success">
      <p>{describeFixHeld(fixHeld, unit)}</p>
      {fixHeld ? (
        <FigureDetails rows={fixHeldDetails(fixHeld, unit)} className="print:hidden" />
      ) : null}
    </div>
  );
}
