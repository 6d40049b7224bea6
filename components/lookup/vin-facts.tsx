import type { VinCheck } from "@/lib/vin";

/** What the VIN says (49 CFR 565), and what is wrong with it. */
export function VinFacts({ check }: { check: VinCheck }) {
  return (
    <div className="text-sm" data-testid="vin-check">
      <p>
        <span className="font-mono">{check.vin || "(empty)"}</span>
        {check.isWellFormed ? (
          check.hasValidCheckDigit ? (
            <span className="ml-2 rounded bg-ok-100 px-1.5 py-0.5 text-ok-700">
              check digit correct (49 CFR 565)
            </span>
          ) : (
            <span className="ml-2 rounded bg-ochre-100 px-1.5 py-0.5 text-ochre-700">
              warning: check digit does not match (49 CFR 565)
            </span>
          )
        ) : null}
      </p>
      {check.isWellFormed ? (
        <p className="mt-1 text-ink-soft">
          Maker code (WMI) <span className="font-mono">{check.wmi}</span> · descriptor (VDS){" "}
          <span className="font-mono">{check.vds}</span> · serial part (VIS){" "}
          <span className="font-mono">{check.vis}</span> · model year{" "}
          {check.modelYear ?? check.modelYears?.join(" or ") ?? "not coded"}
        </p>
      ) : null}
      {check.problems.length > 0 ? (
        <ul className="mt-1 list-disc pl-5 text-ochre-700">
          {check.problems.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      ) : null}
      <p className="mt-1 text-xs text-ink-soft print:hidden">
        Check digit and model year per 49 CFR 565 (position 9: weighted sum mod 11; position 10 with
        the position-7 rule for light vehicles). Outside North America a wrong check digit is only a
        warning.
      </p>
    </div>
  );
}
